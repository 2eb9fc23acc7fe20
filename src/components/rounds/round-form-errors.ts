/**
 * The server's messages for a new round, under the fields they belong to. Messages that go on
 * from the field's name ("must list at least 2 films") are read after the field's label; those
 * that stand alone ("an inter-rater round needs at least 2 raters") are shown as they are.
 */
export const ROUND_FIELD_LABELS: Record<string, string> = {
  name: 'Name',
  kind: 'Kind',
  template: 'Template',
  'templateOptions.segment': 'Segment',
  'options.showResultsBeforeSubmit': 'Showing results',
  'options.gapDays': 'Gap between passes',
  repeats: 'Passes',
  imageIds: 'Films',
  raterIds: 'Raters',
  seed: 'Seed',
}

const CONTINUES_LABEL = /^(must|is|applies)\b/

export function roundFieldMessage(field: string, message: string): string {
  const label = ROUND_FIELD_LABELS[field]
  if (label && CONTINUES_LABEL.test(message)) return `${label} ${message}`
  return message.charAt(0).toUpperCase() + message.slice(1)
}
