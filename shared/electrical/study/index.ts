/** The whole analysis of a diagram: solved cases, figures and the rule checks (analyzeDiagram). */
export { analyzeDiagram, solveLoadCase } from './analyze';
