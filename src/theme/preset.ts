import { definePreset } from '@primeuix/themes'
import Aura from '@primeuix/themes/aura'

/**
 * Endplate's own look: neutral slate chrome and one accent, a deep "marrow" teal, for actions.
 * Aura supplies the component structure only; every colour that carries meaning is set here.
 */
export const endplatePreset = definePreset(Aura, {
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
})
