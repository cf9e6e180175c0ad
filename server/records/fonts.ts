// The fonts the records embed: Atkinson Hyperlegible, shipped as TTF files by an npm package (SIL Open
// Font License 1.1), so nothing is fetched when a record is made. The client bundles the same family
// through @fontsource (woff2, split into unicode ranges, which a PDF font cannot be).
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'

const require = createRequire(import.meta.url)
const packageDir = dirname(require.resolve('@expo-google-fonts/atkinson-hyperlegible/package.json'))

/** The family name the schematic's SVG asks for; the PDF registers its files under this name. */
export const FONT_FAMILY = 'Atkinson Hyperlegible'

export const FONT_FILES = {
  normal: join(packageDir, '400Regular/AtkinsonHyperlegible_400Regular.ttf'),
  bold: join(packageDir, '700Bold/AtkinsonHyperlegible_700Bold.ttf'),
  italics: join(packageDir, '400Regular_Italic/AtkinsonHyperlegible_400Regular_Italic.ttf'),
  bolditalics: join(packageDir, '700Bold_Italic/AtkinsonHyperlegible_700Bold_Italic.ttf'),
} as const

export const FONT_DIRECTORY = packageDir
