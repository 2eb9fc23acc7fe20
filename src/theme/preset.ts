import { definePreset } from '@primeuix/themes'
import auraBase from '@primeuix/themes/aura/base'
import auraCssModule from '@primeuix/themes/aura/css'
import { auraComponents } from './aura-components'

/**
 * Endplate's own look: neutral slate chrome and one accent, a deep "marrow" teal, for actions.
 * Aura supplies the component structure only (for the components Endplate uses, see
 * aura-components.ts); every colour that carries meaning is set here.
 */
// The package's typings declare a named `css` export, but the module exports the string as its
// default (Aura's own index imports it that way).
const auraCss = auraCssModule as unknown as string

export const endplatePreset = definePreset(
  { ...auraBase, components: auraComponents, css: auraCss },
  {
    semantic: {
      primary: {
        50: '#eef7f6',
        100: '#d3ebe8',
        200: '#a8d6d0',
        300: '#75bab2',
        400: '#489b93',
        500: '#2c7f78',
        600: '#226761',
        700: '#1d534f',
        800: '#1a4442',
        900: '#163937',
        950: '#0b2120',
      },
      colorScheme: {
        light: {
          surface: {
            0: '#ffffff',
            50: '#f7f8f9',
            100: '#eef0f2',
            200: '#dde1e5',
            300: '#c3c9cf',
            400: '#9aa2ab',
            500: '#737d87',
            600: '#59626b',
            700: '#444b53',
            800: '#2f353b',
            900: '#1e2226',
            950: '#121517',
          },
        },
      },
    },
  },
)
