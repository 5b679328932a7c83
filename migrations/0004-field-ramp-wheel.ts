// A ramp pose records which wheel is on the ramp; that wheel's lift follows from the distance up
// the ramp and the angle. Poses recorded before keep null (not asked), except where the data say
// it plainly: one lifted wheel whose lift is distance × sin(angle) within half a millimetre.
import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    ALTER TABLE poses ADD COLUMN ramp_wheel text CHECK (ramp_wheel IN ('fl', 'fr', 'rl', 'rr'));
    UPDATE poses SET ramp_wheel = w.wheel
    FROM (
      SELECT id,
        CASE WHEN lift_fl_mm <> 0 THEN 'fl' WHEN lift_fr_mm <> 0 THEN 'fr' WHEN lift_rl_mm <> 0 THEN 'rl' ELSE 'rr' END AS wheel,
        lift_fl_mm + lift_fr_mm + lift_rl_mm + lift_rr_mm AS lift
      FROM poses
      WHERE kind = 'ramp' AND ramp_angle_deg IS NOT NULL AND ramp_distance_mm IS NOT NULL
        AND (lift_fl_mm <> 0)::int + (lift_fr_mm <> 0)::int + (lift_rl_mm <> 0)::int + (lift_rr_mm <> 0)::int = 1
        AND abs(lift_fl_mm + lift_fr_mm + lift_rl_mm + lift_rr_mm - ramp_distance_mm * sin(radians(ramp_angle_deg))) <= 0.5
    ) AS w
    WHERE poses.id = w.id;
  `);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query('ALTER TABLE poses DROP COLUMN IF EXISTS ramp_wheel;');
};
