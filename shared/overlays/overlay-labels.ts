/** A number for an overlay label with its unit: the shared formatter (shared/format). */
export { numberWithUnit as overlayNumberText } from '../format/number-text'
