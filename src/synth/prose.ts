import type { Rng } from './prng.js';

/**
 * Invented body text for randomized layouts. Real forms carry paragraphs of instructions and small print between
 * their fields; a detector that never saw dense text mistakes round letters for checkboxes and text lines for entry
 * areas. These paragraphs hold no labeled boxes, so they teach the detector what is not an entry area.
 */
const SENTENCES = [
  'Please print clearly in black or blue ink.',
  'Fields marked with an asterisk are required.',
  'Return the completed form to the front desk or by post.',
  'Complete one form per applicant and keep a copy for your records.',
  'Incomplete forms may delay processing by up to two weeks.',
  'Write one character per box where boxes are shown.',
  'Use capital letters for names and registration numbers.',
  'If you need more room, attach a separate sheet and write your name on each page.',
  'Check only one box unless the question says otherwise.',
  'Your membership renews on the first day of the month after the date shown above.',
  'Fees are payable in full before a slip, plot or appointment can be confirmed.',
  'We use the details on this form only to manage your account and to contact you about it.',
  'You may ask to see or correct the information we hold about you at any time.',
  'By signing below you confirm that the information given is true and complete to the best of your knowledge.',
  'Cancellations made less than seven days in advance are not refunded.',
  'The office is open Monday to Friday from nine until five, except public holidays.',
  'Step 1 applies to all applicants; complete Steps 2 to 4 only if they apply to you.',
  'See the notes on the back of this page for examples of how to fill in each section.',
  'Enter amounts in whole dollars and round cents to the nearest dollar.',
  'Do not write in the shaded areas, which are for office use only.',
  'If any of the following apply, tick the box and give details in the space provided.',
  'A person under eighteen must have the form signed by a parent or guardian.',
  '(a) Name of the owner, (b) address of the owner, and (c) a daytime telephone number.',
  'Note: a form received after the closing date will be held for the next season.',
];

/** A paragraph of 1..`most` invented sentences. */
export function randomParagraph(rng: Rng, most = 4): string {
  const n = rng.int(1, most);
  return rng.shuffle(SENTENCES).slice(0, n).join(' ');
}
