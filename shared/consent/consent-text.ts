// The consent wording the client agrees to; a new wording gets a new version, and consent is asked again.
export const consentTextVersion = 1;
/** Stands for this wording until the device fetches the clinic's own published consent text. */
export const consentTextId = '7c1f4f8e-3b1a-4c55-9d0e-2f6a1b9c0d11';

export const consentText = [
  'I agree that the practice records the sounds of my heart at four places on my chest, stores the recordings and the measurements made from them, and uses them for wellness follow-up over my visits.',
  'I understand that Fourpoint is not a diagnostic device, and that anything unusual is passed on as a suggestion to see a licensed clinician.',
  'I can ask the practice for a copy of my recordings, or to erase them, at any time.',
] as const;
