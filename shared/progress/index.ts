// Progress on assignments: lateness, standings, averages and their words (see standing.ts for the rules).
export * from './standing'
export * from './words'
