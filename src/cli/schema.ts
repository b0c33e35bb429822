import path from 'node:path';
import type { Command } from 'commander';
import { loadDetector } from '../detect/onnx-detector.js';
import { configError } from '../errors.js';
import { writeJsonAtomic } from '../io/atomic-write.js';
import { checkReferenceImages } from '../schema/blank-images.js';
import { checkSchemaAgainstClasses } from '../schema/consistency.js';
import { formSchemaJsonSchema } from '../schema/json-schema.js';
import { loadSchema } from '../schema/load.js';

/** `formglean schema ...`: check a schema file, write the JSON Schema for editors. Returns the group for subcommands. */
export function registerSchemaCommand(program: Command): Command {
  const schema = program.command('schema').description('Work with form-schema files');

  schema
    .command('check')
    .description('Validate a schema file and its blank images, and its detector classes against a model')
    .argument('<file>', 'schema file (YAML or JSON)')
    .option('--model <file>', 'ONNX detector whose classes the schema must use')
    .action(async (file: string, opts: { model?: string }) => {
      const loaded = await loadSchema(file);
      const missing = await checkReferenceImages(loaded);
      if (missing.length > 0) throw configError(file, `${missing[0]}${missing.length > 1 ? ` (+${missing.length - 1} more)` : ''}`);
      if (opts.model) {
        const detector = await loadDetector(opts.model);
        const problems = checkSchemaAgainstClasses(loaded.schema, detector.classNames);
        await detector.close();
        if (problems.length > 0) {
          const more = problems.length > 1 ? ` (+${problems.length - 1} more)` : '';
          throw configError(file, `${problems[0]}${more}`);
        }
      }
      const s = loaded.schema;
      process.stdout.write(
        `${file}: ok — "${s.form.name}" v${s.form.version}, ${s.pages.length} page(s), ${s.fields.length} fields` +
          `${opts.model ? `, all classes in ${path.basename(opts.model)}` : ''}\n`,
      );
    });

  schema
    .command('json-schema')
    .description('Write the JSON Schema of the schema file format (point "$schema" at it for editor completion)')
    .option('--out <file>', 'where to write it', 'form-schema.json')
    .action(async (opts: { out: string }) => {
      await writeJsonAtomic(opts.out, formSchemaJsonSchema());
      process.stdout.write(`wrote ${opts.out}\n`);
    });

  return schema;
}
