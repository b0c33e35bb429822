/**
 * The 28 fillable real forms (reference/real-forms/pdfs) split for choosing and for reporting: sorted by file name,
 * even positions (0, 2, 4, ...) are the development half, odd positions the held-out half. Thresholds and other
 * choices are made on the development half only; figures are reported on the held-out half.
 */
export const REAL_FORMS = [
  'dod-dd293-2023.pdf', 'dol-wh384-2009.pdf', 'fec-f1m-2001.pdf', 'fec-f3x-2016.pdf', 'fec-f3x-sa-2016.pdf',
  'fec-f99-2019.pdf', 'irs-f1040-2025.pdf', 'irs-f1040v-2025.pdf', 'irs-f2555-2022.pdf', 'irs-f433a-2022.pdf',
  'irs-f433f-2024.pdf', 'irs-f8839-2025.pdf', 'irs-f8888-2025.pdf', 'irs-f8949-2025.pdf', 'irs-f941-2024.pdf',
  'irs-f941x-2022.pdf', 'nara-sf180-2023.pdf', 'ssa-16-2022.pdf', 'ssa-827-2020.pdf', 'uscis-i102-2024.pdf',
  'uscis-i589-2025.pdf', 'uscourts-b106d-2015.pdf', 'uscourts-b106i-2015.pdf', 'uscourts-b108-2015.pdf',
  'uscourts-b121-2015.pdf', 'uscourts-b122a1-2019.pdf', 'uscourts-b2030-2025.pdf', 'va-21-0966-2018.pdf',
].sort();

export const DEVELOPMENT_FORMS = REAL_FORMS.filter((_, i) => i % 2 === 0);
export const HELD_OUT_FORMS = REAL_FORMS.filter((_, i) => i % 2 === 1);
