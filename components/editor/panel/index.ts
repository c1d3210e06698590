export { ResultsPanel } from './results-panel';
export { NodeReadingCard } from './node-reading-card';
export { PartStressCard } from './part-stress-card';
