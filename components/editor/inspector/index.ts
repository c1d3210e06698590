export { BlockInspector } from './block-inspector';
export { SettingsInspector } from './settings-inspector';
