export { zForServiceLevel } from './normal';
export { economicOrderQuantity, safetyStock, reorderPoint, type SafetyStockInput, type ReorderPointInput } from './policy';
export {
  STOCK_MOVEMENT_KINDS,
  stockOnHand,
  demandFromMovements,
  type StockMovementKind,
  type StockMovement,
  type CountDifference,
  type StockOnHand,
  type DemandWindow,
  type DemandEstimate,
} from './stock';
export {
  roundUpToPack,
  orderByDate,
  suggestOrder,
  type OrderByInput,
  type SuggestOrderInput,
  type OrderSuggestion,
} from './order';
export { ORGANISATION_CODE_PATTERN, formatOrderNumber, yearIn, organisationCodeCandidates } from './order-number';
