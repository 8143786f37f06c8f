/** The publish check lives in core (one place for the app and the command line); re-exported here. */
export { publishCheck, shelfKey, type PublishCheck } from '../../src-main/core/editing/publish-check.ts';
