export { COMPARISON_KIND_LABELS, comparisonKindOf, STATIC_LATERAL_VIEWS } from './comparison-kind'
export {
  DIFFERENCE_INTERVAL_METHOD,
  differenceWithInterval,
  valueWithInterval,
} from './difference-interval'
export { compareTable, type CompareSide, type CompareTableInput } from './compare-table'
export { planAchievedRows } from './plan-achieved'
export { suggestComparePairs } from './suggested-pairs'
