// Text from the product brief's "Cautions" section; shown wherever results appear.
export const cautionParagraphs = [
  'Fourpoint records and measures heart sounds for wellness follow-up. It is not a diagnostic device and does not diagnose, treat or prevent disease.',
  'A possible murmur, an irregular rhythm, or a rate outside the clinic\'s range is shown as "refer to a licensed clinician", never as a diagnosis.',
  'Follow local regulations and the scope of your licence. The product makes no claim linking a recording to organs, hormones, stress or supplements.',
] as const;

export const cautionText = cautionParagraphs.join(' ');

/** The only wording for anything outside range or possibly abnormal. */
export const referToClinician = 'refer to a licensed clinician';

/**
 * The caution as the client reads it (report and e-mail): the same caution without the sentence about the
 * practitioner's licence, and "please see" where the practitioner reads "refer".
 */
export const clientCautionParagraphs = [
  cautionParagraphs[0],
  'A possible murmur, an irregular rhythm, or a heart rate outside the clinic\'s range is shown as "please see a licensed clinician", never as a diagnosis.',
  'Fourpoint makes no claim linking a recording to organs, hormones, stress or supplements.',
] as const;

export const clientCautionText = clientCautionParagraphs.join(' ');

/** What the client reads where the practitioner reads "refer to a licensed clinician". */
export const pleaseSeeClinician = 'please see a licensed clinician';

/**
 * A measurement against its range, in words; `outside` is what a figure outside the range asks for (the client's
 * or the practitioner's wording of the referral).
 */
export function rangeStatusWords(
  status: 'in_range' | 'below' | 'above' | 'no_range' | 'no_value',
  outside: string,
): string {
  switch (status) {
    case 'in_range':
      return 'within range';
    case 'below':
      return `below range: ${outside}`;
    case 'above':
      return `above range: ${outside}`;
    case 'no_range':
      return 'no range set';
    default:
      return 'not measured';
  }
}
