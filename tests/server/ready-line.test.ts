import { pino } from 'pino';
import { describe, expect, it } from 'vitest';
import { isReadyLine } from '../../scripts/lib/server-process';

/** The lines a pino logger at `level` writes when server/index.ts announces it is ready, as that file does. */
function announcedLines(level: string): string[] {
  const lines: string[] = [];
  const logger = pino({ level }, { write: (line: string) => void lines.push(line.trimEnd()) });
  logger.info('Brimstock is serving on http://127.0.0.1:5180');
  logger.child({ startup: true }, { level: 'info' }).info({ event: 'ready', url: 'http://127.0.0.1:5180' }, 'Brimstock is ready: open http://127.0.0.1:5180');
  return lines;
}

describe('isReadyLine', () => {
  it('finds the ready record even when LOG_LEVEL lets no info through', () => {
    const lines = announcedLines('warn');
    expect(lines).toHaveLength(1);
    expect(isReadyLine(lines[0])).toBe(true);
  });

  it('passes over the other log lines and text that only mentions being ready', () => {
    const [serving, ready] = announcedLines('info');
    expect(isReadyLine(serving)).toBe(false);
    expect(isReadyLine(ready)).toBe(true);
    expect(isReadyLine('Brimstock is ready: open http://127.0.0.1:5180')).toBe(false);
    expect(isReadyLine('{"event":"ready","msg":')).toBe(false);
    expect(isReadyLine('{"event":"ready","msg":"Something else"}')).toBe(false);
  });
});
