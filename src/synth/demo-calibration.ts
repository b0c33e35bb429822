import type { SchemaFieldCalibration } from '../schema/calibration-yaml.js';
import type { DemoLayoutName } from './layouts.js';
import calibration from './demo/calibration.json' with { type: 'json' };

/**
 * Per-field confidence maps and review thresholds for the demo schemas, when fitted by formglean's own calibration
 * on the development set (`npx tsx bench/eval-set.ts --set dev --write-schemas`, which writes demo/calibration.json;
 * `npm run samples:make` then regenerates the schemas). Kept as data beside the layouts so that samples:make writes
 * the same schemas. Empty as shipped: the demo schemas use the shipped maps per type and script
 * (src/fields/default-confidence.json) like any schema drafted for a new layout.
 */
export interface DemoCalibration {
  /** Where the values come from, written as a comment at the top of the schema. */
  note: string;
  fields: Record<string, SchemaFieldCalibration>;
}

export const DEMO_CALIBRATION_FILE = 'src/synth/demo/calibration.json';

export function demoCalibration(name: DemoLayoutName): DemoCalibration | undefined {
  // Checked where it ends up: the schema written from it is parsed with FormSchema like any other.
  return (calibration as unknown as Partial<Record<string, DemoCalibration>>)[name];
}
