/**
 * The engineering-aid caution shown wherever a result could be mistaken for a qualification
 * (results page, printed run report). One constant, so every screen says the same thing.
 */
export const CAUTION = 'Results support, and never replace, physical testing, the applicable standards and regulations, and the judgement of qualified engineers.';
