// Every model, imported explicitly (no directory scan: the server is bundled),
// and the associations between them in one place.
import { sequelize } from '@/db/sequelize';
import { Organisation } from './organisation';
import { Site } from './site';
import { User } from './user';
import { UserToken } from './user-token';
import { Setting } from './setting';
import { AuditEntry } from './audit-entry';
import { MailMessage } from './mail-message';
import { Attachment } from './attachment';
import { BinType } from './bin-type';
import { LinerLot } from './liner-lot';
import { LinerSpec } from './liner-spec';
import { LinerSupplier } from './liner-supplier';
import { HireOrder } from './hire-order';
import { Asset } from './asset';
import { Trip } from './trip';
import { ScanEvent } from './scan-event';
import { ScanEventKey } from './scan-event-key';
import { Inspection } from './inspection';
import { CollectionRequest } from './collection-request';
import { DamageReport } from './damage-report';
import { Load } from './load';
import { GridView } from './grid-view';
import { Tariff } from './tariff';
import { Trailer } from './trailer';
import { TruckRun, TruckRunStop } from './truck-run';

Organisation.hasMany(Site, { foreignKey: 'organisationId', as: 'sites' });
Site.belongsTo(Organisation, { foreignKey: 'organisationId', as: 'organisation' });
Organisation.hasMany(User, { foreignKey: 'organisationId', as: 'users' });
User.belongsTo(Organisation, { foreignKey: 'organisationId', as: 'organisation' });
User.belongsTo(Site, { foreignKey: 'homeSiteId', as: 'homeSite' });
UserToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
AuditEntry.belongsTo(User, { foreignKey: 'userId', as: 'user' });

Asset.belongsTo(BinType, { foreignKey: 'binTypeId', as: 'binType' });
Asset.belongsTo(Site, { foreignKey: 'siteId', as: 'site' });
Asset.belongsTo(Organisation, { foreignKey: 'customerId', as: 'customer' });
Asset.belongsTo(Trip, { foreignKey: 'currentTripId', as: 'currentTrip', constraints: false });
Asset.belongsTo(LinerLot, { foreignKey: 'linerLotId', as: 'linerLot' });
Asset.hasMany(Trip, { foreignKey: 'assetId', as: 'trips' });
Asset.hasMany(ScanEvent, { foreignKey: 'assetId', as: 'events' });
Asset.hasMany(Inspection, { foreignKey: 'assetId', as: 'inspections' });

Trip.belongsTo(Asset, { foreignKey: 'assetId', as: 'asset' });
Trip.belongsTo(Organisation, { foreignKey: 'customerId', as: 'customer' });
Trip.belongsTo(HireOrder, { foreignKey: 'hireOrderId', as: 'hireOrder' });
Trip.belongsTo(Site, { foreignKey: 'depotSiteId', as: 'depotSite' });
Trip.belongsTo(Site, { foreignKey: 'customerSiteId', as: 'customerSite' });
Trip.belongsTo(Site, { foreignKey: 'closingSiteId', as: 'closingSite' });
Trip.belongsTo(LinerLot, { foreignKey: 'linerLotId', as: 'linerLot' });

ScanEvent.belongsTo(Asset, { foreignKey: 'assetId', as: 'asset' });
ScanEvent.belongsTo(Site, { foreignKey: 'siteId', as: 'site' });
ScanEvent.belongsTo(User, { foreignKey: 'userId', as: 'user' });
ScanEvent.belongsTo(Trip, { foreignKey: 'tripId', as: 'trip' });

Inspection.belongsTo(Asset, { foreignKey: 'assetId', as: 'asset' });
Inspection.belongsTo(User, { foreignKey: 'inspectorId', as: 'inspector' });
LinerLot.belongsTo(Site, { foreignKey: 'siteId', as: 'site' });
LinerLot.belongsTo(LinerSpec, { foreignKey: 'linerSpecId', as: 'linerSpec' });
LinerLot.belongsTo(LinerSupplier, { foreignKey: 'supplierId', as: 'linerSupplier' });
LinerSpec.belongsTo(LinerSupplier, { foreignKey: 'supplierId', as: 'supplier' });
HireOrder.belongsTo(Organisation, { foreignKey: 'customerId', as: 'customer' });
HireOrder.belongsTo(Site, { foreignKey: 'deliverySiteId', as: 'deliverySite' });
HireOrder.belongsTo(Site, { foreignKey: 'depotSiteId', as: 'depotSite' });
HireOrder.belongsTo(BinType, { foreignKey: 'binTypeId', as: 'binType' });
CollectionRequest.belongsTo(Site, { foreignKey: 'siteId', as: 'site' });
CollectionRequest.belongsTo(Asset, { foreignKey: 'assetId', as: 'asset' });
CollectionRequest.belongsTo(Organisation, { foreignKey: 'customerId', as: 'customer' });
DamageReport.belongsTo(Asset, { foreignKey: 'assetId', as: 'asset' });
DamageReport.belongsTo(Site, { foreignKey: 'siteId', as: 'site' });
DamageReport.belongsTo(Organisation, { foreignKey: 'customerId', as: 'customer' });
DamageReport.belongsTo(Attachment, { foreignKey: 'photoId', as: 'photo' });
Load.belongsTo(HireOrder, { foreignKey: 'hireOrderId', as: 'hireOrder' });
Load.belongsTo(Site, { foreignKey: 'depotSiteId', as: 'depotSite' });
Load.belongsTo(Site, { foreignKey: 'destinationSiteId', as: 'destinationSite' });
Trip.belongsTo(Load, { foreignKey: 'loadId', as: 'load' });

GridView.belongsTo(User, { foreignKey: 'ownerId', as: 'owner' });
Tariff.belongsTo(Organisation, { foreignKey: 'customerId', as: 'customer' });
Organisation.hasMany(Tariff, { foreignKey: 'customerId', as: 'tariffs' });
TruckRun.belongsTo(Site, { foreignKey: 'depotSiteId', as: 'depotSite' });
TruckRun.belongsTo(Trailer, { foreignKey: 'trailerId', as: 'trailer' });
TruckRun.hasMany(TruckRunStop, { foreignKey: 'runId', as: 'stops' });
TruckRunStop.belongsTo(Site, { foreignKey: 'siteId', as: 'site' });
CollectionRequest.belongsTo(TruckRun, { foreignKey: 'truckRunId', as: 'truckRun' });

export {
  sequelize,
  Organisation,
  Site,
  User,
  UserToken,
  Setting,
  AuditEntry,
  MailMessage,
  Attachment,
  BinType,
  LinerLot,
  HireOrder,
  Asset,
  Trip,
  ScanEvent,
  ScanEventKey,
  Inspection,
  CollectionRequest,
  DamageReport,
  Load,
  GridView,
  Tariff,
  LinerSpec,
  LinerSupplier,
  Trailer,
  TruckRun,
  TruckRunStop,
};
