export { EngineeringInput, type EngineeringInputProps } from './engineering-input';
export { TextCommitInput } from './text-commit-input';
export { ChoiceField } from './choice-field';
export { SpecFields } from './spec-fields';
