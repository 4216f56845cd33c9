import { ReviewSessionsScreen } from '@/features/review/review-sessions-screen';

/** The practitioner's home is the review table of synced sessions. */
export function PractitionerHomeScreen() {
  return <ReviewSessionsScreen testID="practitioner-home" />;
}
