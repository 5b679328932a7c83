// One live reading per pose, gauge point and axis, and one live gauge point per label on a vehicle,
// checked when a transaction commits instead of row by row. A batch from the field may swap two
// labels, or clear a reading and type another into its slot: row by row, the first statement would
// meet the row the second one frees. A cleared (soft-deleted) reading no longer holds its slot.
// Exclusion constraints with = are unique constraints that may be partial and deferrable.
import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    ALTER TABLE readings DROP CONSTRAINT readings_pose_id_gauge_point_id_axis_key;
    ALTER TABLE readings ADD CONSTRAINT readings_slot
      EXCLUDE USING btree (pose_id WITH =, gauge_point_id WITH =, axis WITH =) WHERE (deleted_at IS NULL)
      DEFERRABLE INITIALLY DEFERRED;
    CREATE INDEX readings_pose ON readings(pose_id);
    DROP INDEX gauge_points_label;
    ALTER TABLE gauge_points ADD CONSTRAINT gauge_points_label
      EXCLUDE USING btree (vehicle_id WITH =, label WITH =) WHERE (deleted_at IS NULL)
      DEFERRABLE INITIALLY DEFERRED;
  `);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    ALTER TABLE gauge_points DROP CONSTRAINT gauge_points_label;
    CREATE UNIQUE INDEX gauge_points_label ON gauge_points(vehicle_id, label) WHERE deleted_at IS NULL;
    DROP INDEX readings_pose;
    ALTER TABLE readings DROP CONSTRAINT readings_slot;
    ALTER TABLE readings ADD CONSTRAINT readings_pose_id_gauge_point_id_axis_key UNIQUE (pose_id, gauge_point_id, axis);
  `);
};
