// Every model, imported explicitly (no directory scan: the server is bundled),
// and the associations between them in one place.
import { sequelize } from '../lib/server/db';
import { Organisation } from './organisation';
import { Site } from './site';
import { User } from './user';
import { UserToken } from './user-token';
import { Setting } from './setting';
import { AuditEntry } from './audit-entry';
import { MailMessage } from './mail-message';

Organisation.hasMany(Site, { foreignKey: 'organisationId', as: 'sites' });
Site.belongsTo(Organisation, { foreignKey: 'organisationId', as: 'organisation' });
Organisation.hasMany(User, { foreignKey: 'organisationId', as: 'users' });
User.belongsTo(Organisation, { foreignKey: 'organisationId', as: 'organisation' });
User.belongsTo(Site, { foreignKey: 'homeSiteId', as: 'homeSite' });
UserToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
AuditEntry.belongsTo(User, { foreignKey: 'userId', as: 'user' });

export { sequelize, Organisation, Site, User, UserToken, Setting, AuditEntry, MailMessage };
