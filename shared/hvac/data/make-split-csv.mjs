// Writes target-split.csv from the reconstruction described in README.md: the recalled 70 °F row,
// 20.9 − 0.08·(WB − 50) − 0.024·(WB − 50)², stepped 0.55 °F per °F of dry bulb. Run once; replace
// the CSV's cells with the published table's when it is to hand.
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const lines = ['return_db_f,return_wb_f,target_split_f'];
for (let db = 70; db <= 84; db++) {
  for (let wb = 50; wb <= 76; wb++) {
    if (wb > db) continue;
    const w = wb - 50;
    const t = 20.9 + 0.55 * (db - 70) - 0.08 * w - 0.024 * w * w;
    lines.push(`${db},${wb},${t.toFixed(1)}`);
  }
}
writeFileSync(join(here, 'target-split.csv'), lines.join('\n') + '\n');
console.log(`wrote target-split.csv: ${lines.length - 1} cells`);
