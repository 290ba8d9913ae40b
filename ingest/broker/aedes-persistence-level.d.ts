// aedes-persistence-level 9.x ships no types; this is the one call we use.
declare module 'aedes-persistence-level' {
  /** Wraps a level database (level ≥ 9, e.g. `new Level(dir)`) as an aedes persistence. */
  export default function aedesPersistenceLevel(db: unknown): unknown;
}
