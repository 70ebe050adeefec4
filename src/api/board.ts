import type { BoardHistory, StockBoard } from '@shared/schemas';
import { http } from './http';

/** The stock board of every farm the user may see. Live updates arrive over socket.io (see useBoardSocket). */
export function fetchBoard(): Promise<StockBoard> {
  return http.get<StockBoard>('/api/board');
}

/** Usable litres per contents for each of the last 14 days. */
export function fetchBoardHistory(): Promise<BoardHistory> {
  return http.get<BoardHistory>('/api/board/history');
}
