/**
 * Property tests are reproducible: one seed for every fast-check run (FC_SEED overrides
 * it to explore further; a failure prints the seed and path to replay).
 */
import fc from 'fast-check'

fc.configureGlobal({ seed: Number(process.env.FC_SEED ?? 20261202) })
