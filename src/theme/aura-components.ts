// Aura's design tokens for the PrimeVue components Endplate uses (and the ones those render
// inside themselves, such as the data table's paginator), instead of Aura's full set of 80-odd
// components: the theme ships with the first screen, so every unused component is download
// weight for every user. tests/client/theme-components.test.ts fails when a component imported
// under src/ is missing here.
import badge from '@primeuix/themes/aura/badge'
import button from '@primeuix/themes/aura/button'
import checkbox from '@primeuix/themes/aura/checkbox'
import chip from '@primeuix/themes/aura/chip'
import confirmdialog from '@primeuix/themes/aura/confirmdialog'
import datatable from '@primeuix/themes/aura/datatable'
import dialog from '@primeuix/themes/aura/dialog'
import iconfield from '@primeuix/themes/aura/iconfield'
import inputnumber from '@primeuix/themes/aura/inputnumber'
import inputtext from '@primeuix/themes/aura/inputtext'
import message from '@primeuix/themes/aura/message'
import multiselect from '@primeuix/themes/aura/multiselect'
import paginator from '@primeuix/themes/aura/paginator'
import password from '@primeuix/themes/aura/password'
import progressbar from '@primeuix/themes/aura/progressbar'
import progressspinner from '@primeuix/themes/aura/progressspinner'
import radiobutton from '@primeuix/themes/aura/radiobutton'
import ripple from '@primeuix/themes/aura/ripple'
import select from '@primeuix/themes/aura/select'
import selectbutton from '@primeuix/themes/aura/selectbutton'
import tabs from '@primeuix/themes/aura/tabs'
import tag from '@primeuix/themes/aura/tag'
import textarea from '@primeuix/themes/aura/textarea'
import toast from '@primeuix/themes/aura/toast'
import togglebutton from '@primeuix/themes/aura/togglebutton'
import toggleswitch from '@primeuix/themes/aura/toggleswitch'
import virtualscroller from '@primeuix/themes/aura/virtualscroller'

export const auraComponents = {
  badge,
  button,
  checkbox,
  chip,
  confirmdialog,
  datatable,
  dialog,
  iconfield,
  inputnumber,
  inputtext,
  message,
  multiselect,
  paginator,
  password,
  progressbar,
  progressspinner,
  radiobutton,
  ripple,
  select,
  selectbutton,
  tabs,
  tag,
  textarea,
  toast,
  togglebutton,
  toggleswitch,
  virtualscroller,
}
