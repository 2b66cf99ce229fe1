/**
 * Reading and writing structure files: XYZ, extended XYZ, MDL molfile/SD (V2000 and V3000), PDB,
 * CML and QCSchema JSON in; XYZ, extended XYZ, molfile V2000, QCSchema JSON and Pointfold's
 * unique-atoms format out.
 * Pure TypeScript (no Node or DOM APIs).
 */
export * from './types';
export { DEFAULT_MAX_ATOMS, MAX_ABS_COORDINATE, type ByteSource, type ReadOptions } from './common';
export { detectFormat, iterateStructures, readStructures } from './read';
export { OUTPUT_EXTENSIONS, VERIFY_TOLERANCE, outputFileName, verifyWritten, writeStructure } from './write';
export { BOHR_IN_ANGSTROM } from './qcschema';
export { BOND_SLACK, guessBonds } from './molfile';
export { XYZ_DECIMALS } from './xyz';
export { centreOfMass, expandUniqueAtoms, readUniqueAtoms, type UniqueAtomsFile } from './unique';
export { elementFromAtomName } from './pdb';
export { TEMPLATE_DECIMALS, TEMPLATE_PLACEHOLDERS, describeTemplateProblems, renderTemplate, validateTemplate, type RenderTemplateOptions, type TemplatePlaceholder } from './template';
