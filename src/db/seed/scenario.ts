// The invented demo scenario: a pool operator with three depots and six
// customers in the Rhine–Scheldt area. Names are invented; coordinates are
// plausible places so distances and the site picture make sense.

export const OPERATOR = {
  name: 'Northmere Bin Pool',
  contactEmail: 'pool@northmere.example',
  gs1CompanyPrefix: '9521234', // GS1 prefix range 952 is reserved for demonstrations
  gs1PrefixLength: 7,
  timeZone: 'Europe/Amsterdam',
  currency: 'EUR',
  taxRate: '0.2100',
  mailSender: 'Northmere Bin Pool <pool@northmere.example>',
  returnInstructions:
    'Fold the empty bin flat, keep its lid and valve cap with it, and report it below as ready for collection. ' +
    'Our haulier collects within three working days. Questions: +31 10 000 0000 (pool desk).',
};

export const DEPOTS = [
  { code: 'DEP-RTM', name: 'Rotterdam Botlek depot', address: 'Welplaatweg 12, Rotterdam', lat: 51.8853, lon: 4.3047 },
  { code: 'DEP-DUI', name: 'Duisburg Rheinhafen depot', address: 'Hafenstraße 40, Duisburg', lat: 51.453, lon: 6.74 },
  { code: 'DEP-ANR', name: 'Antwerp Kallo depot', address: 'Sint-Jansweg 3, Kallo', lat: 51.26, lon: 4.289 },
] as const;

export const REPAIR_SHOP = { code: 'REP-VNO', name: 'Venlo bin repair shop', address: 'Industrieweg 9, Venlo', lat: 51.3704, lon: 6.1724 };

export interface DemoCustomer {
  name: string;
  email: string;
  freeDays: number;
  dailyRate: string;
  tripFee: string;
  lostBinFee: string;
  homeDepot: string;
  sites: Array<{ code: string; name: string; address: string; lat: number; lon: number; role: 'filling' | 'receiving' }>;
}

export const CUSTOMERS: DemoCustomer[] = [
  {
    name: 'Halden Oils',
    email: 'orders@haldenoils.example',
    freeDays: 21,
    dailyRate: '1.60',
    tripFee: '24.00',
    lostBinFee: '780.00',
    homeDepot: 'DEP-RTM',
    sites: [
      { code: 'HAL-ZWD', name: 'Halden Oils — Zwijndrecht filling', address: 'Oostkade 5, Zwijndrecht', lat: 51.8176, lon: 4.6389, role: 'filling' },
      { code: 'HAL-MDK', name: 'Halden Oils — Moerdijk blending', address: 'Middenweg 22, Moerdijk', lat: 51.6986, lon: 4.6236, role: 'receiving' },
    ],
  },
  {
    name: 'Brightwater Syrups',
    email: 'logistics@brightwater.example',
    freeDays: 14,
    dailyRate: '1.90',
    tripFee: '28.00',
    lostBinFee: '820.00',
    homeDepot: 'DEP-ANR',
    sites: [
      { code: 'BWS-GNT', name: 'Brightwater Syrups — Ghent plant', address: 'Kennedylaan 80, Ghent', lat: 51.0868, lon: 3.7337, role: 'filling' },
      { code: 'BWS-EHV', name: 'Brightwater Syrups — Eindhoven bottling', address: 'Hurksestraat 14, Eindhoven', lat: 51.4466, lon: 5.4136, role: 'receiving' },
    ],
  },
  {
    name: 'Kestrel Coatings',
    email: 'supply@kestrelcoatings.example',
    freeDays: 30,
    dailyRate: '1.20',
    tripFee: '20.00',
    lostBinFee: '700.00',
    homeDepot: 'DEP-DUI',
    sites: [
      { code: 'KES-CGN', name: 'Kestrel Coatings — Cologne works', address: 'Niehler Damm 3, Cologne', lat: 50.9838, lon: 6.9662, role: 'filling' },
      { code: 'KES-DTM', name: 'Kestrel Coatings — Dortmund mixing', address: 'Hafenweg 17, Dortmund', lat: 51.5312, lon: 7.4387, role: 'receiving' },
    ],
  },
  {
    name: 'Marlow Dairy Ingredients',
    email: 'planning@marlowdairy.example',
    freeDays: 14,
    dailyRate: '2.10',
    tripFee: '30.00',
    lostBinFee: '850.00',
    homeDepot: 'DEP-RTM',
    sites: [{ code: 'MDI-LWD', name: 'Marlow Dairy — Leeuwarden creamery', address: 'Zuiderweg 51, Leeuwarden', lat: 53.1904, lon: 5.8148, role: 'filling' }],
  },
  {
    name: 'Verdane Chemicals',
    email: 'ibc@verdane.example',
    freeDays: 21,
    dailyRate: '1.50',
    tripFee: '26.00',
    lostBinFee: '900.00',
    homeDepot: 'DEP-DUI',
    sites: [
      { code: 'VRD-LUH', name: 'Verdane Chemicals — Ludwigshafen site', address: 'Industriestraße 120, Ludwigshafen', lat: 49.5183, lon: 8.4092, role: 'filling' },
      { code: 'VRD-GLN', name: 'Verdane Chemicals — Geleen unit', address: 'Koolweg 6, Geleen', lat: 50.9799, lon: 5.7917, role: 'receiving' },
    ],
  },
  {
    name: 'Ostby Fruit Concentrates',
    email: 'ops@ostbyfruit.example',
    freeDays: 21,
    dailyRate: '1.75',
    tripFee: '25.00',
    lostBinFee: '760.00',
    homeDepot: 'DEP-ANR',
    sites: [{ code: 'OFC-RMD', name: 'Ostby Fruit — Roermond press house', address: 'Mijnheerkensweg 30, Roermond', lat: 51.1855, lon: 5.9818, role: 'filling' }],
  },
];

/**
 * Billing details of the demo customers (invented VAT numbers in each country's shape): the operator is Dutch, so
 * the Belgian and German customers get reverse charge, the Dutch ones the operator's VAT rate. Liners fitted per
 * trip and stops of collection runs are charged at these fees.
 */
export const CUSTOMER_BILLING: Record<string, { country: string; vatId: string; linerFee: string; stopFee: string }> = {
  'Halden Oils': { country: 'NL', vatId: 'NL861204337B01', linerFee: '6.50', stopFee: '45.00' },
  'Brightwater Syrups': { country: 'BE', vatId: 'BE0712345619', linerFee: '7.20', stopFee: '55.00' },
  'Kestrel Coatings': { country: 'DE', vatId: 'DE287654310', linerFee: '6.50', stopFee: '60.00' },
  'Marlow Dairy Ingredients': { country: 'NL', vatId: 'NL803311920B01', linerFee: '8.40', stopFee: '50.00' },
  'Verdane Chemicals': { country: 'DE', vatId: 'DE301122334', linerFee: '6.90', stopFee: '60.00' },
  'Ostby Fruit Concentrates': { country: 'NL', vatId: 'NL855667788B01', linerFee: '7.20', stopFee: '45.00' },
};

/** Extra staff beside the four demo logins. */
export const EXTRA_STAFF = [
  { role: 'yard', email: 'yard.duisburg@northmere.example', name: 'Lena Vogt', homeDepot: 'DEP-DUI', qualifiedInspector: true },
  { role: 'yard', email: 'yard.antwerp@northmere.example', name: 'Jef Claes', homeDepot: 'DEP-ANR', qualifiedInspector: false },
] as const;

/** What each customer fills (drives the fill records of the demo trips). */
export const PRODUCTS: Record<string, string> = {
  'Halden Oils': 'Rapeseed oil, refined',
  'Brightwater Syrups': 'Glucose syrup 80 %',
  'Kestrel Coatings': 'Water-based acrylic binder',
  'Marlow Dairy Ingredients': 'Liquid milk permeate',
  'Verdane Chemicals': 'Sodium hydroxide solution 25 %',
  'Ostby Fruit Concentrates': 'Apple juice concentrate',
};

/** The demo fleet's trailers (inside sizes of common practice for European trailers; invented names). */
export const TRAILERS = [
  { name: 'Curtainsider 13.6 m', insideLengthMm: 13600, insideWidthMm: 2480, insideHeightMm: 2700, payloadKg: 24000 },
  { name: 'High-cube 13.6 m', insideLengthMm: 13600, insideWidthMm: 2480, insideHeightMm: 3000, payloadKg: 24000 },
  { name: 'Rigid 7.3 m', insideLengthMm: 7300, insideWidthMm: 2450, insideHeightMm: 2500, payloadKg: 9500 },
] as const;

/** The two bin models of the demo pool (invented model names). */
export const BIN_TYPES = [
  {
    code: 'FX1000',
    name: 'Foldaway 1000 — steel-framed, UN 31HA2',
    graiAssetType: '10010',
    nominalCapacityL: 1000,
    tareKg: '86.0',
    maxGrossKg: '1285.0',
    footprintLengthMm: 1200,
    footprintWidthMm: 1000,
    heightErectedMm: 1160,
    heightFoldedMm: 380,
    unCode: '31HA2',
    policyKind: 'un' as const,
    intermediateMonths: 30,
    fullMonths: 60,
  },
  {
    code: 'FX1250',
    name: 'Foldaway 1250 — food-grade plastic walls',
    graiAssetType: '12510',
    nominalCapacityL: 1250,
    tareKg: '98.0',
    maxGrossKg: '1500.0',
    footprintLengthMm: 1200,
    footprintWidthMm: 1000,
    heightErectedMm: 1330,
    heightFoldedMm: 420,
    unCode: null,
    policyKind: 'own' as const,
    intermediateMonths: 24,
    fullMonths: 48,
  },
];

/**
 * Invented liner suppliers, their terms and the spec each delivers (article numbers invented). Both specs
 * are listed for both bin types (a 1,250 L bag sits in the 1,000 L bin too in this scenario); the third
 * spec, a threaded-valve bag for the 1,250 L bin only, has no lots yet.
 */
export const LINER_SUPPLIERS = [
  {
    name: 'Polyvale Liners',
    prefix: 'PV',
    spec: 'PE/PA 1,000–1,250 L bag with 2" bottom valve, food grade',
    terms: { orderEmail: 'orders@polyvale.example', leadTimeDays: 10, orderCost: '85.00', packSize: 50, minOrderQty: 200, pricePerLiner: '6.40' },
    specRecord: {
      code: 'PV-1250-DN50',
      name: 'PE/PA food-grade bag, 1,250 L, DN50 butterfly valve',
      material: 'PE/PA',
      layers: 2,
      nominalCapacityL: 1250,
      valveType: 'butterfly' as const,
      valveSize: 'DN50',
      glandSize: 'DN150',
      foodContact: true,
      maxFillTempC: 60,
      articleNumber: 'PVL-1250-50F',
    },
  },
  {
    name: 'Carrow Films',
    prefix: 'CF',
    spec: 'Multilayer PE 1,000 L bag, EVOH barrier, 2" valve',
    terms: { orderEmail: 'sales@carrowfilms.example', leadTimeDays: 21, orderCost: '120.00', packSize: 40, minOrderQty: 160, pricePerLiner: '7.90' },
    specRecord: {
      code: 'CF-1000-DN50',
      name: 'PE/EVOH/PE barrier bag, 1,000 L, DN50 ball valve',
      material: 'PE/EVOH/PE',
      layers: 3,
      nominalCapacityL: 1000,
      valveType: 'ball' as const,
      valveSize: 'DN50',
      glandSize: 'DN150',
      foodContact: true,
      maxFillTempC: 45,
      articleNumber: 'CF-EV1000-B50',
    },
  },
];

/** A spec with no lots yet: listed for the 1,250 L bin only. */
export const EXTRA_LINER_SPEC = {
  supplier: 'Polyvale Liners',
  code: 'PV-1250-S60',
  name: 'PE bag, 1,250 L, S60x6 threaded spout',
  material: 'PE',
  layers: 1,
  nominalCapacityL: 1250,
  valveType: 'spout' as const,
  valveSize: 'S60x6',
  glandSize: 'DN150',
  foodContact: false,
  maxFillTempC: null,
  articleNumber: 'PVL-1250-S60',
  binTypeCodes: ['FX1250'],
};
