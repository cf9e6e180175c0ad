// Migrations in order, listed explicitly (no glob: bundlers and tsx need static imports).
import { InitialSchema1764600000000 } from './1764600000000-initial-schema'

export const migrations = [InitialSchema1764600000000]
