import { Identity1796161344465 } from './1796161344465-Identity';
import { AuthSecurity1796161594609 } from './1796161594609-AuthSecurity';
import { Batches1796161670587 } from './1796161670587-Batches';
import { ExportTemplates1796166577773 } from './1796166577773-ExportTemplates';

/**
 * Every migration class in order of its timestamp. Generate with
 * `npm run migration:generate -- server/db/migrations/<Name>` and add it here.
 */
export const migrations: Function[] = [Identity1796161344465, AuthSecurity1796161594609, Batches1796161670587, ExportTemplates1796166577773];
