/**
 * The demo team's parts library: a few presets an installer keeps on hand. Makers and part numbers are
 * invented. Figures are typical catalogue-style values written for the demo, not any product's data;
 * presets are starting points to check against each part's own marked ratings.
 */
import { parseLibraryCsv, type LibraryItem } from '../../shared/library';

const DEMO_LIBRARY_CSV = `kind,name,manufacturer,partNumber,chemistry,nominal_V,capacity_Ah,r_internal_ohm,max_continuous_A,conductor,material,stranding,insulation_C,fuseClass,rating_A,voltage_rating_V,interrupting_A,width_mm,thickness_mm,tapCount,tapSpacing_m
battery,"LFP 12.8 V 100 Ah, house",Tidewater Cells,TW-LF100,lfp,12.8,100,0.004,100,,,,,,,,,,,,
battery,"LFP 12.8 V 200 Ah, house",Tidewater Cells,TW-LF200,lfp,12.8,200,0.0025,200,,,,,,,,,,,,
battery,AGM 12 V 110 Ah,Harrowgate Power,HG-A110,agm,12,110,0.005,,,,,,,,,,,,,
cable,Tinned flex 2/0 AWG,Marlinspike Wire,,,,,,,2/0 AWG,copper,flexible,105,,,,,,,,
cable,Welding flex 35 mm²,Marlinspike Wire,,,,,,,35 mm²,copper,flexible,90,,,,,,,,
cable,Flex 4 AWG (chargers),,,,,,,,4 AWG,copper,flexible,105,,,,,,,,
fuse,Class T 300 A,Breakwater Protection,BW-T300,,,,,,,,,,Class T,300,160,20000,,,,
fuse,ANL 200 A,Breakwater Protection,BW-ANL200,,,,,,,,,,ANL,200,32,6000,,,,
busbar,Six-stud copper bar 250 A,Ironbark Electric,IB-6S250,,,,,,,copper,,,,250,,,25,6,6,40 mm
`;

export function demoLibraryItems(): LibraryItem[] {
  const parsed = parseLibraryCsv(DEMO_LIBRARY_CSV);
  if (!parsed.ok) throw new Error(`The demo library does not parse: ${JSON.stringify(parsed.rows)}`);
  return parsed.items;
}
