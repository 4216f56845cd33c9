import type { Site } from '@/shared/protocol';

export type SiteInfo = {
  id: Site;
  label: string;
  /** Where the chest piece goes and how the client sits and breathes (common practice, no source). */
  placement: string;
};

// Capture order follows the brief: mitral, tricuspid, aortic, pulmonic.
export const sites: readonly SiteInfo[] = [
  {
    id: 'mitral',
    label: 'Mitral',
    placement:
      'Apex, 5th intercostal space at the left mid-clavicular line; client turned slightly to the left, breathing normally.',
  },
  {
    id: 'tricuspid',
    label: 'Tricuspid',
    placement:
      '4th intercostal space at the lower left edge of the sternum; client lying on the back, breathing normally.',
  },
  {
    id: 'aortic',
    label: 'Aortic',
    placement:
      '2nd intercostal space just right of the sternum; client sitting and leaning forward, holding the breath after breathing out.',
  },
  {
    id: 'pulmonic',
    label: 'Pulmonic',
    placement:
      '2nd intercostal space just left of the sternum; client sitting, holding the breath after breathing out.',
  },
];

export function siteInfo(id: Site): SiteInfo {
  const found = sites.find((s) => s.id === id);
  if (!found) throw new Error(`Unknown site ${id}`);
  return found;
}
