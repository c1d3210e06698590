export * from './netlist/types';
export * from './netlist/units';
export * from './netlist/parse';
export * from './netlist/format';
export * from './document/schema';
export * from './document/starters';
