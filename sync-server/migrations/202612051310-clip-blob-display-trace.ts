import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// The band-passed display trace of a clip (min and max per bucket, scaled to -1..1), computed once when the clip
// is processed, so a review or a report reads it instead of opening and filtering the clip on every view. It sits
// on the clip's row, so erasing the clip erases its trace. Clips processed before this column have none: the
// first view computes it from the clip and stores it.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE clip_blobs ADD COLUMN trace jsonb`);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE clip_blobs DROP COLUMN IF EXISTS trace`);
};
