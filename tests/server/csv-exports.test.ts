// Every CSV the server hands out keeps a spreadsheet from running a cell as a formula, also when the
// spreadsheet splits on ; or a tab instead of the comma: a cell starting with = + - @ is prefixed with '
// (OWASP, "CSV Injection"), a cell holding ; or a tab is quoted, and a ; tab or line break inside a
// cell is never followed straight by a formula character. The checks read each file three ways: as
// CSV (papaparse), and split naively on ; and on a tab as a reader set to that separator would.
import { randomUUID } from 'node:crypto';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { toCsv } from '../../server/csv';
import { readOutbox, readOutboxMessage } from '../../server/mail/outbox';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { makeInput } from '../support/inventory';
import { waitForMail } from '../support/mail';
import { makeTank } from '../support/tanks';

const env = useTestApp();
const FORMULA_START = /^[=+\-@]/;

/** The cells a reader splitting on `separator` would make, a leading quote taken as opening a quoted cell. */
function cellsSplitOn(csv: string, separator: string): string[] {
  return csv.split(/\r\n|\n|\r/).flatMap((line) => line.split(separator)).map((cell) => cell.replace(/^\uFEFF/, '').replace(/^"/, ''));
}

function expectSafe(csv: string, text: string) {
  const cells = Papa.parse<string[]>(csv.replace(/^\uFEFF/, ''), { skipEmptyLines: true }).data.flat();
  // A reader splitting on commas gets the text within a cell, with a ' before the part that would start a formula.
  expect(cells.some((c) => c.includes(text.replace(/([;\t])=/, "$1'=")))).toBe(true);
  for (const separator of [';', '\t']) expect(cellsSplitOn(csv, separator).filter((c) => FORMULA_START.test(c))).toEqual([]);
}

const TEXTS = ['a;=1+1', 'a\t=1+1'];

type MakeCsv = (text: string) => Promise<string>;
const EXPORTS: [string, MakeCsv][] = [
  [
    'the calibration table (tank name in the title)',
    async (text) => {
      const org = await makeOrganisation(env);
      const tank = await makeTank(env, org, org.farmIds[0], { code: 'CX' });
      await tank.update({ name: text });
      const manager = await signedIn(env, org.users.manager.email);
      return (await manager.get(`/api/tanks/${tank.id}/calibration?step=500&format=csv`).expect(200)).text;
    },
  ],
  [
    'the inputs list (input and farm names)',
    async (text) => {
      const org = await makeOrganisation(env);
      const { input } = await makeInput(env, org, org.farmIds[0]);
      await input.update({ name: text });
      const buyer = await signedIn(env, org.users.buyer.email);
      return (await buyer.get('/api/inputs?format=csv').expect(200)).text;
    },
  ],
  [
    'the orders list (item name)',
    async (text) => {
      const org = await makeOrganisation(env);
      const { input, supplier } = await makeInput(env, org, org.farmIds[0]);
      await input.update({ name: text });
      const buyer = await signedIn(env, org.users.buyer.email);
      await call(buyer, 'post', '/api/orders', { supplierId: supplier.id, farmId: input.farmId, lines: [{ inputId: input.id, quantity: 20 }] }).expect(201);
      return (await buyer.get('/api/orders?format=csv').expect(200)).text;
    },
  ],
  [
    "an order e-mail's CSV attachment (item name)",
    async (text) => {
      const org = await makeOrganisation(env);
      const { input, supplier } = await makeInput(env, org, org.farmIds[0]);
      await input.update({ name: text });
      const buyer = await signedIn(env, org.users.buyer.email);
      const order = (await call(buyer, 'post', '/api/orders', { supplierId: supplier.id, farmId: input.farmId, lines: [{ inputId: input.id, quantity: 20 }] }).expect(201)).body;
      await call(buyer, 'post', `/api/orders/${order.id}/send`).expect(200);
      await waitForMail(env.config.outboxDir, supplier.email);
      const mail = (await readOutbox(env.config.outboxDir)).find((m) => m.to.includes(supplier.email))!;
      const message = await readOutboxMessage(env.config.outboxDir, mail.id);
      return message!.files[0].toString('utf8');
    },
  ],
  [
    'the refused rows of an import (the value as read)',
    async (text) => {
      const org = await makeOrganisation(env);
      const tank = await makeTank(env, org, org.farmIds[0], { code: 'RX' });
      const worker = await signedIn(env, org.users.worker.email);
      const file = `time,level_mm\n2025-05-01T00:00:00Z,900\n2025-05-01T01:00:00Z,"${text}"\n`;
      const mapping = { delimiter: ',', hasHeader: true, timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level_mm', kind: 'level', unit: 'mm' } };
      const res = await worker
        .post('/api/imports')
        .set('x-csrf-token', worker.csrf)
        .field('tankId', String(tank.id))
        .field('mapping', JSON.stringify(mapping))
        .field('policy', 'valid-rows')
        .attach('files', Buffer.from(file, 'utf8'), { filename: `${randomUUID()}.csv`, contentType: 'text/csv' })
        .expect(201);
      return (await worker.get(`/api/imports/${res.body.imports[0].id}/rejected.csv`).expect(200)).text;
    },
  ],
];

describe('CSV downloads', () => {
  it.each(EXPORTS.flatMap(([name, make]) => TEXTS.map((text) => [name, JSON.stringify(text), text, make] as const)))('%s: a cell %s stays one harmless cell for any separator', async (_name, _shown, text, make) => {
    expectSafe(await make(text), text);
  });
});

describe('toCsv', () => {
  it.each([
    ['a formula at the start', '=1+1', `"'=1+1"`],
    ['a formula at the start of a cell that goes on over a line break', '=1+1\nmore', `"'=1+1\nmore"`],
    ['a formula after a line break', 'a\n=1+1', `"a\n'=1+1"`],
    ['a formula after a semicolon', 'a;=1+1', `"a;'=1+1"`],
    ['a minus sign after a tab', 'a\t-2', `"a\t'-2"`],
    ['a semicolon without a formula', 'pH 6.5; mild', '"pH 6.5; mild"'],
    ['plain text', 'Kelp concentrate', 'Kelp concentrate'],
  ])('writes %s safely', (_name, cell, written) => {
    expect(toCsv([[cell]])).toBe(written);
  });

  it('leaves numbers alone, negative ones too, and names fields', () => {
    expect(toCsv({ fields: ['level_mm', 'note'], data: [[-20, 'x'], [1.5, '@home']] })).toBe("level_mm,note\r\n-20,x\r\n1.5,\"'@home\"");
  });
});
