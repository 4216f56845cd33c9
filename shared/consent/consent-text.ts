// The consent wording the client agrees to; a new wording gets a new version, and consent is asked again.
// Every clinic is created with it as its version 1 (sync-server clinics-repository), so a consent signed on a
// phone that has not yet fetched the clinic's wording still names a version the clinic has.
export const consentTextVersion = 1;
export const consentTextTitle = 'Heart-sound recording consent';

export const consentText = [
  'I agree that the practice records the sounds of my heart at four places on my chest, stores the recordings and the measurements made from them, and uses them for wellness follow-up over my visits.',
  'I understand that Fourpoint is not a diagnostic device, and that anything unusual is passed on as a suggestion to see a licensed clinician.',
  'I can ask the practice for a copy of my recordings, or to erase them, at any time.',
] as const;
