import path from 'node:path';
import { writeFileAtomic } from '../io/atomic-write.js';
import { encodePage } from './encode-page.js';
import { demoLayout, type DemoLayoutName } from './layouts.js';
import { REFERENCE_DPI } from './layout-model.js';
import { renderBlank } from './render-page.js';
import { demoCalibration } from './demo-calibration.js';
import { schemaFromLayout } from './schema-from-layout.js';
import { schemaYaml } from '../schema/yaml-write.js';

/** The text of schemas/<layout>.yaml: the layout's fields with the demo calibration (demo-calibration.ts). */
export function demoSchemaText(name: DemoLayoutName): string {
  const layout = demoLayout(name);
  const calibration = demoCalibration(name);
  const header =
    `# ${layout.title}: invented demo form. Written by \`npm run samples:make\` from src/synth/demo/${name}.ts.\n` +
    (calibration ? `# ${calibration.note}\n` : '');
  return header + schemaYaml(schemaFromLayout(layout, undefined, calibration));
}

/** Write schemas/<layout>.yaml and the blank reference schemas/<layout>.blank.png for a demo form. */
export async function writeDemoSchema(name: DemoLayoutName, dir: string): Promise<{ schema: string; blank: string }> {
  const layout = demoLayout(name);
  const schema = path.join(dir, `${name}.yaml`);
  const blank = path.join(dir, `${name}.blank.png`);
  await writeFileAtomic(schema, demoSchemaText(name));
  await writeFileAtomic(blank, await encodePage(await renderBlank(layout), 'png', REFERENCE_DPI, 85, true));
  return { schema, blank };
}
