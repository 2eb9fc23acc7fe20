import type { ReadingTemplate } from '../types/domain'
import { TEMPLATE_LABELS, type TemplateOptions } from './templates'

/**
 * A reading named as people say it: the template and the segments it reads, e.g. "Slip grade
 * L5-S1" or "Construct check L3-L4, L4-L5, L5-S1".
 */
export function readingTitle(template: ReadingTemplate, options: TemplateOptions): string {
  const segments =
    options.segment ??
    (options.construct?.map((entry) => entry.segment) ?? options.discReplacements)?.join(', ')
  return segments ? `${TEMPLATE_LABELS[template]} ${segments}` : TEMPLATE_LABELS[template]
}
