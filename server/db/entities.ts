import { AuditEntry } from '../modules/audit/entity';
import { Batch, Structure } from '../modules/batches/entity';
import { ReviewEvent } from '../modules/reviews/entity';
import { SessionRecord } from '../modules/auth/session.entity';
import { BatchExportTemplate, ExportTemplate } from '../modules/templates/entity';
import { ApiToken } from '../modules/tokens/entity';
import { User } from '../modules/users/entity';
import { Membership, Workspace } from '../modules/workspaces/entity';
import { Invitation } from '../modules/workspaces/invitation.entity';

/**
 * Every TypeORM entity class, listed explicitly (no globs: tsx and bundlers both load this).
 * Add a new entity here and write its migration (see DEVELOPERS.md).
 */
export const entities: Function[] = [User, Workspace, Membership, ApiToken, Invitation, AuditEntry, SessionRecord, Batch, Structure, ReviewEvent, ExportTemplate, BatchExportTemplate];
