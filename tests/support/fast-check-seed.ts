// Every property test runs with one fixed seed, so a run is repeatable and a failure is a real
// finding, never chance. To explore new cases on purpose, set FC_SEED to another number; a failing
// seed is printed by fast-check and can be pinned the same way.
import fc from 'fast-check';

fc.configureGlobal({ seed: Number(process.env.FC_SEED ?? 20261202) });
