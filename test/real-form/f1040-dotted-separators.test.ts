import { afterAll, describe, expect, it } from 'vitest';
import { OcrEngine } from '../../src/api.js';
import { readStripFields } from './strip-fields.js';

const ocr = new OcrEngine();
afterAll(async () => {
  await ocr.close();
});

describe('comb fields with dotted separators printed between cells (IRS Form 1040, typed fill)', () => {
  it('reads the digits and letters without the dots', async () => {
    // The form prints its SSN combs with dotted lines between the groups of cells; invented values typed through its
    // own fields (fixture README). Regions drafted by `schema from-pdf`, boxes where extract read them. The dots read "431i;" and "Farimeir".
    const ssn = await readStripFields(
      { page: 'irs-f1040-ssn-typed.png', blank: 'irs-f1040-ssn-blank.png', origin: { x: 1290, y: 245 } },
      [
        { name: 'your_ssn', type: 'text', region: [1302, 261, 298, 39], box: [1301.5, 258.4, 298.4, 39.1], options: { maxLength: 9 } },
        { name: 'spouse_ssn', type: 'text', region: [1302, 327, 298, 40], box: [1301.5, 324.5, 298.4, 40.1], options: { maxLength: 9 } },
      ],
      ocr,
    );
    expect(ssn.your_ssn.value).toBe('431');
    expect(ssn.spouse_ssn.value).toBe('942730');
    const dependents = await readStripFields(
      { page: 'irs-f1040-dependents-typed.png', blank: 'irs-f1040-dependents-blank.png', origin: { x: 390, y: 900 } },
      [
        { name: 'dependent_2_ssn', type: 'text', region: [702, 924, 296, 35], box: [700.6, 922.5, 296.4, 35.1], options: { maxLength: 9 } },
        { name: 'dependent_3_ssn', type: 'text', region: [1002, 924, 296, 35], box: [1001, 922.4, 296.4, 35.1], options: { maxLength: 9 } },
        { name: 'dependent_4_ssn', type: 'text', region: [1302, 924, 298, 35], box: [1301.4, 922.3, 298.4, 35.1], options: { maxLength: 9 } },
      ],
      ocr,
    );
    // Values the filler typed into the dependents' SSN combs (its word lists, not numbers: invented text either way).
    expect(dependents.dependent_2_ssn.value).toBe('Farmer');
    expect(dependents.dependent_3_ssn.value).toBe('1675');
    expect(dependents.dependent_4_ssn.value).toBe('Fernmoor');
  }, 120_000);
});
