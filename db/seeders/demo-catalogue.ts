/**
 * The invented demo catalogue and job templates. Suppliers, part numbers and descriptions are
 * fictional and generic. Limits on checklist items are examples for the demo only, labelled so on
 * screen: the engineer works to the manufacturer's current data.
 */
import type { ChecklistLimit, JobType, LineKind, SupplierKind, VatRateCode } from '../../shared/src/index.js';

export const DEMO_SUPPLIERS: { key: string; name: string; kind: SupplierKind; email: string; phone: string; notes: string }[] = [
  { key: 'loft', name: 'Gullsedge Sail Loft', kind: 'sail_loft', email: 'orders@gullsedge-loft.example', phone: '01632 960 640', notes: 'Re-covers and sail repairs; about three weeks for a full wing.' },
  { key: 'prop', name: 'Tarnbeck Propeller Works', kind: 'propeller_shop', email: 'bench@tarnbeck-props.example', phone: '01632 960 655', notes: 'Blade repairs, balancing and overhauls.' },
  { key: 'spares', name: 'Westshire Light Aero Spares', kind: 'parts', email: 'counter@westshire-spares.example', phone: '01632 960 671', notes: 'Next-day delivery on stock items ordered before 2 pm.' },
];

export interface DemoPart {
  key: string;
  partNumber: string;
  description: string;
  unitCost: string;
  unitPrice: string | null;
  markupPercent: string | null;
  vatRate: VatRateCode;
  supplier: string;
  leadTimeDays: number;
}

export const DEMO_PARTS: DemoPart[] = [
  { key: 'plug', partNumber: 'WS-1201', description: 'Spark plug, resistor type, 12 mm thread', unitCost: '6.8000', unitPrice: null, markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 1 },
  { key: 'oilFilter', partNumber: 'WS-2210', description: 'Oil filter, spin-on, for the 80 hp flat-four', unitCost: '11.4000', unitPrice: null, markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 1 },
  { key: 'oil', partNumber: 'WS-2230', description: 'Engine oil, semi-synthetic four-stroke, 1 litre', unitCost: '9.1000', unitPrice: null, markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 1 },
  { key: 'airFilter', partNumber: 'WS-2250', description: 'Air filter element, pod type', unitCost: '24.5000', unitPrice: null, markupPercent: '25', vatRate: 'standard', supplier: 'spares', leadTimeDays: 3 },
  { key: 'gasket', partNumber: 'WS-3105', description: 'Exhaust flange gasket', unitCost: '3.2000', unitPrice: null, markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 1 },
  { key: 'hose', partNumber: 'WS-3320', description: 'Coolant hose, 25 mm bore, 0.5 m', unitCost: '7.9000', unitPrice: null, markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 2 },
  { key: 'clamp', partNumber: 'WS-3340', description: 'Hose clamp, stainless, 12–22 mm', unitCost: '1.1500', unitPrice: '2.50', markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 1 },
  { key: 'fuelHose', partNumber: 'WS-3410', description: 'Fuel hose, 6 mm bore, per metre', unitCost: '8.7500', unitPrice: null, markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 2 },
  { key: 'gearOil', partNumber: 'WS-4120', description: 'Gearbox oil, 1 litre', unitCost: '8.6000', unitPrice: null, markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 1 },
  { key: 'gearNut', partNumber: 'WS-4150', description: 'Drive-gear castellated nut with split pin', unitCost: '14.2000', unitPrice: null, markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 5 },
  { key: 'wire', partNumber: 'WS-5010', description: 'Locking wire, stainless, 0.8 mm, per metre', unitCost: '0.4000', unitPrice: '1.00', markupPercent: null, vatRate: 'standard', supplier: 'spares', leadTimeDays: 1 },
  { key: 'cloth', partNumber: 'WS-6200', description: 'Polyester sailcloth, per metre', unitCost: '18.0000', unitPrice: null, markupPercent: '15', vatRate: 'standard', supplier: 'loft', leadTimeDays: 10 },
];

/** Example limits, marked as examples: trade practice, not any one manufacturer's figure. */
export const PLUG_GAP_LIMIT: ChecklistLimit = {
  min: null,
  max: '0.9',
  unit: 'mm',
  // Common practice, recalled from memory: 0.6–0.7 mm when new, 0.9 mm wear limit.
  source: "Example: 0.6–0.7 mm new, 0.9 mm wear limit (common practice). Use the manufacturer's current data.",
};
export const DRIVE_GEAR_NUT_LIMIT: ChecklistLimit = {
  min: '200',
  max: null,
  unit: 'N·m',
  // Common practice, recalled from memory; the gearbox maker's manual governs.
  source: "Example: holds at 200 N·m (common practice). Use the manufacturer's current data.",
};

export interface DemoTemplateLine {
  kind: LineKind;
  description: string;
  quantity: string;
  labourRateCode?: string;
  part?: string;
  supplier?: string;
  amount?: string;
  caution?: string;
}

export interface DemoTemplate {
  key: string;
  name: string;
  jobType: JobType;
  description: string;
  lines: DemoTemplateLine[];
  checklist: { section: string; text: string; limit?: ChecklistLimit; caution?: string }[];
}

/*
 * Cautions on the demo templates. They are common workshop practice for these tasks, written for
 * the demo: they are not taken from any manufacturer's manual, and a workshop replaces them with
 * its own procedures and the manufacturer's current data.
 */
const CAUTION = {
  propellerLive:
    'Treat the propeller as live: ignition off, plug leads removed and nobody at the controls before anyone turns the propeller. Stand clear of its arc.',
  compression:
    'Treat the propeller as live: ignition off and plug leads removed before turning the engine. Air pressure in the cylinder can turn the propeller, so hold it and keep clear of its arc.',
  engineRun:
    'Engine run: wheels chocked and the aircraft tied down, the propeller arc and the area behind it clear, a competent person at the controls, hearing protection on.',
  fuel: 'Fuel: no ignition sources near (no smoking, no naked lights, no sparks), electrics off, fuel caught in a proper container, space ventilated, extinguisher to hand.',
  hotEngine: 'Let the engine cool first: hot oil, coolant and exhaust burn. Open a coolant cap only when cold.',
  plugs: 'Ignition off before the plug leads come off; with a plug out the engine can still kick if the propeller is turned.',
  wingHandling: 'Two people to lift the wing; support it on padded trestles so the structure is not bent while stripped.',
} as const;

const PLUG_CHECK = { section: 'Engine', text: 'Spark plug electrode gap, each plug', limit: PLUG_GAP_LIMIT, caution: CAUTION.plugs };

export const DEMO_TEMPLATES: DemoTemplate[] = [
  {
    key: 'annual',
    name: 'Annual permit inspection',
    jobType: 'annual_permit_inspection',
    description: 'The yearly inspection for the permit renewal: airframe, engine, controls and paperwork.',
    lines: [
      { kind: 'labour', description: 'Annual inspection: airframe, engine, controls and records', quantity: '6', labourRateCode: 'standard', caution: CAUTION.propellerLive },
      { kind: 'part', description: 'Oil filter', quantity: '1', part: 'oilFilter' },
      { kind: 'part', description: 'Engine oil', quantity: '3', part: 'oil' },
      { kind: 'fee', description: 'Permit paperwork and logbook entries', quantity: '1', amount: '45.00' },
    ],
    checklist: [
      { section: 'Airframe', text: 'Wing and strut attachment bolts, safety and wear' },
      { section: 'Airframe', text: 'Undercarriage legs, wheels, tyres and brakes' },
      { section: 'Controls', text: 'Control cables: tension, routing, end fittings and locking' },
      { section: 'Controls', text: 'Full and free movement, correct sense' },
      PLUG_CHECK,
      { section: 'Engine', text: 'Coolant hoses and clamps', caution: CAUTION.hotEngine },
      { section: 'Engine', text: 'Exhaust flanges, springs and mounts', caution: CAUTION.hotEngine },
      { section: 'Records', text: 'Logbooks and modification record up to date' },
    ],
  },
  {
    key: '100h',
    name: '100-hour engine service',
    jobType: 'engine_service_100h',
    description: 'Oil and filter, inspection of the ignition, cooling, fuel and exhaust systems.',
    lines: [
      { kind: 'labour', description: '100-hour engine service', quantity: '3', labourRateCode: 'standard', caution: CAUTION.engineRun },
      { kind: 'part', description: 'Oil filter', quantity: '1', part: 'oilFilter' },
      { kind: 'part', description: 'Engine oil', quantity: '3', part: 'oil' },
    ],
    checklist: [
      { section: 'Engine', text: 'Oil filter element cut open: no metal', caution: CAUTION.hotEngine },
      PLUG_CHECK,
      { section: 'Engine', text: 'Carburettor balance and idle (engine run)', caution: CAUTION.engineRun },
      { section: 'Engine', text: 'Coolant hoses and clamps', caution: CAUTION.hotEngine },
      { section: 'Engine', text: 'Exhaust flanges, springs and mounts', caution: CAUTION.hotEngine },
      { section: 'Engine', text: 'Fuel hoses: age, chafe and clamps', caution: CAUTION.fuel },
    ],
  },
  {
    key: '200h',
    name: '200-hour engine service',
    jobType: 'engine_service_200h',
    description: 'The 100-hour work plus new plugs, air filter and a gearbox check.',
    lines: [
      { kind: 'labour', description: '200-hour engine service', quantity: '5', labourRateCode: 'standard', caution: CAUTION.engineRun },
      { kind: 'part', description: 'Oil filter', quantity: '1', part: 'oilFilter' },
      { kind: 'part', description: 'Engine oil', quantity: '3', part: 'oil' },
      { kind: 'part', description: 'Spark plugs', quantity: '4', part: 'plug' },
      { kind: 'part', description: 'Air filter element', quantity: '1', part: 'airFilter' },
    ],
    checklist: [
      { section: 'Engine', text: 'Oil filter element cut open: no metal', caution: CAUTION.hotEngine },
      PLUG_CHECK,
      { section: 'Engine', text: 'Compression, each cylinder', caution: CAUTION.compression },
      { section: 'Engine', text: 'Coolant hoses and clamps', caution: CAUTION.hotEngine },
      { section: 'Gearbox', text: 'Drive-gear nut torque', limit: DRIVE_GEAR_NUT_LIMIT },
    ],
  },
  {
    key: 'wing',
    name: 'Wing strip inspection and re-cover',
    jobType: 'wing_strip_recover',
    description: 'Strip the wing covering, inspect the structure, re-cover through the sail loft and refit.',
    lines: [
      { kind: 'labour', description: 'Strip covering, inspect structure, refit', quantity: '14', labourRateCode: 'sailcloth', caution: CAUTION.wingHandling },
      { kind: 'subcontract', description: 'Re-cover wing in new polyester cloth', quantity: '1', supplier: 'loft', amount: '680.00' },
      { kind: 'fee', description: 'Transport to and from the sail loft', quantity: '1', amount: '60.00' },
    ],
    checklist: [
      { section: 'Structure', text: 'Spars and ribs: dents, cracks and corrosion' },
      { section: 'Structure', text: 'Strut fittings and attachment points' },
      { section: 'Covering', text: 'Batten pockets and stitching' },
      { section: 'Covering', text: 'Cloth strength test, upper surface' },
    ],
  },
  {
    key: 'gearbox',
    name: 'Gearbox inspection',
    jobType: 'gearbox_inspection',
    description: 'Drain and inspect the reduction gearbox, check the drive-gear nut and backlash.',
    lines: [
      { kind: 'labour', description: 'Gearbox inspection', quantity: '2.5', labourRateCode: 'standard' },
      { kind: 'part', description: 'Gearbox oil', quantity: '1', part: 'gearOil' },
      { kind: 'part', description: 'Locking wire', quantity: '1', part: 'wire' },
    ],
    checklist: [
      { section: 'Gearbox', text: 'Magnetic drain plug: no metal', caution: CAUTION.hotEngine },
      { section: 'Gearbox', text: 'Drive-gear nut torque', limit: DRIVE_GEAR_NUT_LIMIT, caution: CAUTION.propellerLive },
      { section: 'Gearbox', text: 'Backlash at the propeller flange', caution: CAUTION.propellerLive },
    ],
  },
];
