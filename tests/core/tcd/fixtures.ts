/** Loads tests/fixtures/tcd/reference.json (made by scripts/fixtures/tcd_reference.py from SciPy/NumPy). */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

export const ref = JSON.parse(readFileSync(fileURLToPath(new URL('../../fixtures/tcd/reference.json', import.meta.url)), 'utf8')) as {
  t975: Record<string, number>;
  regression: { rate: number[]; L_um: number[]; B: number; lnA: number; r2: number; seB: number; seLnA: number };
  integrals: { rho_m: number; a_m: number; d_m: number; creagerParis_int: number; creagerParis_moment: number; kirschEdge_int: number; kirschEdge_moment: number };
  percentile: { data: number[]; p2_5: number; p50: number; p97_5: number };
  mulberry32_seed1: number[];
  mulberry32_seed123456789: number[];
};
