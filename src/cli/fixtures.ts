/**
 * Write the invented plate fixtures: `npx tsx src/cli/fixtures.ts [outDir]` (default `fixtures/`).
 * Files go to <outDir>/plates/; everything in them is simulated (see its README.md).
 */
import { mkdir, writeFile } from "node:fs/promises";
import { dirname, join, resolve } from "node:path";
import { buildFixtureSet } from "../lib/plates/fixture-set";

async function main(): Promise<void> {
  const outDir = resolve(process.argv[2] ?? "fixtures");
  const set = await buildFixtureSet();
  const base = join(outDir, "plates");
  for (const f of set.files) {
    const path = join(base, f.path);
    await mkdir(dirname(path), { recursive: true });
    await writeFile(path, f.contents);
  }
  console.log(
    `wrote ${set.files.length} invented plate fixture files to ${base} (${set.good.length} good exports, ${set.bad.length} bad files)`,
  );
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
