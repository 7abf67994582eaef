import { v7 } from "uuid";

/**
 * A key for a row of a table that only grows, one row per reading (readings, their judgements): a time-ordered UUID
 * (version 7, RFC 9562 §5.7: the Unix time in milliseconds, then random bits). RFC 9562 §2.1 gives the reason
 * (from memory): random (version 4) keys have poor index locality, so each insert lands on a random page of the
 * primary key's B-tree. At 5,000,000 readings those indexes outgrow PostgreSQL's cache, and a reading's write waited
 * on reading index pages in (IO:DataFileRead); keys in the order they are made are added at one end of the index,
 * whose pages stay in the cache. Besides the time, 74 bits: within one millisecond the `uuid` package counts up from
 * a random start (a counter, RFC 9562 §6.2), so keys made in one process also sort in the order they were made.
 */
export const timeOrderedId = (): string => v7();
