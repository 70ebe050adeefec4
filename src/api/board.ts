import type { BoardHistory, StockBoard } from '@shared/schemas';
import { getConditional, http, type ConditionalAnswer } from './http';

/** The stock board of every farm the user may see. Live changes after it arrive over socket.io as numbered deltas (see useBoardSocket). */
export function fetchBoard(): Promise<StockBoard> {
  return http.get<StockBoard>('/api/board');
}

/** The stock board, unless it still matches `etag` (the tag of the board fetched last): then `notModified`. */
export function fetchBoardIfChanged(etag: string | null): Promise<ConditionalAnswer<StockBoard>> {
  return getConditional<StockBoard>('/api/board', etag);
}

/** Usable litres per contents for each of the last 14 days. */
export function fetchBoardHistory(): Promise<BoardHistory> {
  return http.get<BoardHistory>('/api/board/history');
}
