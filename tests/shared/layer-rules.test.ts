// The layer rules of shared/, server/ and src/ README.md are ESLint rules (eslint.config.ts): each
// wrong-way import below is refused with the rule's own message, and each right-way one passes clean.
import { fileURLToPath } from 'node:url';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../..', import.meta.url));
let eslint: ESLint;

// Loading the TypeScript config and its plugins takes a few seconds on a busy machine: done once, here.
beforeAll(async () => {
  eslint = new ESLint({ cwd: root, overrideConfigFile: 'eslint.config.ts' });
  await eslint.calculateConfigForFile(`${root}shared/index.ts`);
}, 60_000);

async function lint(filePath: string, code: string) {
  const [result] = await eslint.lintText(code, { filePath: `${root}${filePath}` });
  return result.messages.map((m) => ({ rule: m.ruleId, message: m.message }));
}

describe('layer rules in eslint.config.ts', () => {
  it.each([
    ['shared/readings/wrong.ts', "import { tankFor } from '../../server/services/tanks';\nexport const f = tankFor;\n", 'no-restricted-imports', /shared\/ imports nothing of server\/ or src\//],
    ['shared/board/wrong.ts', "import { useTanksStore } from '../../src/stores/tanks';\nexport const s = useTanksStore;\n", 'no-restricted-imports', /shared\/ imports nothing of server\/ or src\//],
    ['shared/board/wrong.ts', "import { useTanksStore } from '@/stores/tanks';\nexport const s = useTanksStore;\n", 'no-restricted-imports', /shared\/ imports nothing of src\/ \(the @\/ alias\)/],
    ['shared/units/wrong.ts', "import { ref } from 'vue';\nexport const r = ref(0);\n", 'no-restricted-imports', /shared\/ is plain TypeScript/],
    ['shared/units/wrong.ts', "import { readFileSync } from 'node:fs';\nexport const read = readFileSync;\n", 'no-restricted-imports', /shared\/ uses no Node-only module/],
    ['shared/units/wrong.ts', "import { join } from 'path';\nexport const j = join;\n", 'no-restricted-imports', /shared\/ uses no Node-only module/],
    ['server/routes/wrong.ts', "import { Tank } from '../models/tank';\nexport const model = Tank;\n", 'no-restricted-imports', /Routes never touch models/],
    ['server/routes/wrong.ts', "import { QueryTypes } from 'sequelize';\nexport const t = QueryTypes;\n", 'no-restricted-imports', /Routes never touch models/],
    ['server/routes/wrong.ts', "export const save = (ctx: { db: { models: unknown } }) => ctx.db.models;\n", 'no-restricted-syntax', /Routes never touch models: ctx\.db belongs in a service/],
    ['server/services/wrong.ts', "import { requireSignIn } from '../middleware/access';\nexport const gate = requireSignIn;\n", 'no-restricted-imports', /Services never import middleware or routes/],
    ['server/services/wrong.ts', "import { tanksRouter } from '../routes/tanks';\nexport const r = tanksRouter;\n", 'no-restricted-imports', /Services never import middleware or routes/],
    ['server/services/wrong.ts', "import type { Request } from 'express';\nexport type R = Request;\n", 'no-restricted-imports', /Services never import middleware or routes, and see no req\/res/],
    ['server/csv-wrong.ts', "import { http } from '../src/api/http';\nexport const h = http;\n", 'no-restricted-imports', /server\/ never imports src\//],
    ['src/stores/wrong.ts', "import { createApp } from '../../server/app';\nexport const a = createApp;\n", 'no-restricted-imports', /src\/ never imports server\//],
    ['src/stores/wrong.ts', "export const load = () => fetch('/api/tanks');\n", 'no-restricted-globals', /Components, views and stores never fetch/],
  ])('refuses %s importing the wrong way (%#)', async (filePath, code, rule, message) => {
    const messages = await lint(filePath, code);
    expect(messages, JSON.stringify(messages)).toHaveLength(1);
    expect(messages[0].rule).toBe(rule);
    expect(messages[0].message).toMatch(message);
  });

  it.each([
    ['shared/readings/right.ts', "import { z } from 'zod';\nimport { toLitres } from '../units/index';\nexport const s = [z, toLitres];\n"],
    ['shared/readings/right.ts', "import { capacityL } from '@shared/calibration/index';\nexport const c = capacityL;\n"],
    ['server/routes/right.ts', "import { Router } from 'express';\nimport { requireSignIn } from '../middleware/access';\nimport { listTanks } from '../services/tanks';\nexport const parts = [Router, requireSignIn, listTanks];\n"],
    ['server/services/right.ts', "import { QueryTypes } from 'sequelize';\nimport { assertFarmAccess } from './access';\nimport { Tank } from '../models/tank';\nexport const parts = [QueryTypes, assertFarmAccess, Tank];\nexport const read = (ctx: { db: { models: unknown } }) => ctx.db.models;\n"],
    ['server/middleware/right.ts', "import { sessionUserFor } from '../services/auth';\nexport const k = sessionUserFor;\n"],
    ['src/stores/right.ts', "import { stockFigures } from '@shared/readings/index';\nimport { http } from '@/api/http';\nexport const parts = [stockFigures, http];\n"],
    ['src/api/right.ts', "export const load = () => fetch('/api/tanks');\n"],
  ])('passes %s importing the right way (%#)', async (filePath, code) => {
    expect(await lint(filePath, code)).toEqual([]);
  });
});
