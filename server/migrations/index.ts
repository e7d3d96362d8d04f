import type { QueryInterface } from 'sequelize';
import * as initialSchema from './0001-initial-schema.js';
import * as peopleAndInvitations from './0002-people-and-invitations.js';
import * as partTransfers from './0005-part-transfers.js';
import * as reportIndexes from './0007-report-indexes.js';
import * as signInIdentity from './0008-sign-in-identity.js';
import * as rateLimitStore from './0010-rate-limit-store.js';
import * as attachmentEtag from './0009-attachment-etag.js';
import * as approvalEventsWithoutNames from './0011-approval-events-without-names.js';
import * as runDepartureAndApprovedEstimate from './0014-run-departure-and-approved-estimate.js';
import * as shopClosingDays from './0015-shop-closing-days.js';
import * as customerLinksAndDecisions from './0017-customer-links-and-decisions.js';
import * as intakeAccessories from './0018-intake-accessories.js';
import * as hazardTags from './0020-hazard-tags.js';
import * as hazardTagsFromNames from './0021-hazard-tags-from-names.js';

type Step = (params: { context: QueryInterface }) => Promise<void>;

/**
 * Migrations in order. Listed here rather than globbed so they load the same way under tsx,
 * Vitest and a compiled build. Add each new file to the end; never reorder or rename applied ones.
 */
export const migrations: Array<{ name: string; up: Step; down: Step }> = [
  { name: '0001-initial-schema', ...initialSchema },
  { name: '0002-people-and-invitations', ...peopleAndInvitations },
  { name: '0005-part-transfers', ...partTransfers },
  { name: '0007-report-indexes', ...reportIndexes },
  { name: '0008-sign-in-identity', ...signInIdentity },
  { name: '0009-attachment-etag', ...attachmentEtag },
  { name: '0010-rate-limit-store', ...rateLimitStore },
  { name: '0011-approval-events-without-names', ...approvalEventsWithoutNames },
  { name: '0014-run-departure-and-approved-estimate', ...runDepartureAndApprovedEstimate },
  { name: '0015-shop-closing-days', ...shopClosingDays },
  { name: '0017-customer-links-and-decisions', ...customerLinksAndDecisions },
  { name: '0018-intake-accessories', ...intakeAccessories },
  { name: '0020-hazard-tags', ...hazardTags },
  { name: '0021-hazard-tags-from-names', ...hazardTagsFromNames },
];
