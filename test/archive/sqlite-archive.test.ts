/** The archive conformance suite on the SQLite store (a real database file in a temp folder). */
import { describeArchiveBehaviour } from './conformance-behaviour.ts';
import { describeArchiveIntegrity } from './conformance-integrity.ts';
import { sqliteFactory } from './store-handles.ts';

describeArchiveBehaviour(sqliteFactory());
describeArchiveIntegrity(sqliteFactory());
