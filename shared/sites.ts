import { siteSchema, type Site } from '@/shared/protocol';

export type SiteInfo = {
  id: Site;
  label: string;
  /** Where the chest piece goes and how the client sits and breathes (common practice, no source). */
  placement: string;
};

// Keyed by Site, so a site added to the protocol's enum fails the typecheck here until it has its words.
const siteWords: Record<Site, Omit<SiteInfo, 'id'>> = {
  mitral: {
    label: 'Mitral',
    placement:
      'Apex, 5th intercostal space at the left mid-clavicular line; client turned slightly to the left, breathing normally.',
  },
  tricuspid: {
    label: 'Tricuspid',
    placement:
      '4th intercostal space at the lower left edge of the sternum; client lying on the back, breathing normally.',
  },
  aortic: {
    label: 'Aortic',
    placement:
      '2nd intercostal space just right of the sternum; client sitting and leaning forward, holding the breath after breathing out.',
  },
  pulmonic: {
    label: 'Pulmonic',
    placement:
      '2nd intercostal space just left of the sternum; client sitting, holding the breath after breathing out.',
  },
};

/** In capture order, which is the order of the protocol's site enum: mitral, tricuspid, aortic, pulmonic. */
export const sites: readonly SiteInfo[] = siteSchema.options.map((id) => ({ id, ...siteWords[id] }));

export function siteInfo(id: Site): SiteInfo {
  const found = sites.find((s) => s.id === id);
  if (!found) throw new Error(`Unknown site ${id}`);
  return found;
}
