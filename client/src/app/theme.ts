import '@fontsource/manrope/400.css';
import '@fontsource/manrope/500.css';
import '@fontsource/manrope/600.css';
import '@fontsource/manrope/700.css';
import { Badge, Button, Card, createTheme, Paper, Table, TextInput, type MantineColorsTuple } from '@mantine/core';

// Ostium's own palette: a deep clinical teal, warm greys for surfaces, amber and plum for difficulty.
const lagoon: MantineColorsTuple = ['#e8f4f3', '#cfe6e4', '#a2cfcb', '#72b6b1', '#4aa09a', '#2f8a84', '#1f7570', '#14625e', '#0f5c5c', '#06403f'];
const stone: MantineColorsTuple = ['#f7f5f2', '#efebe6', '#e2ddd5', '#d2cbc1', '#b9b0a4', '#9b9185', '#7d7468', '#625a50', '#48423b', '#2f2b26'];
const amber: MantineColorsTuple = ['#fff6e3', '#ffecc4', '#fcd98a', '#f8c552', '#f3b32a', '#e29d12', '#c5840a', '#9f6a08', '#7b5207', '#573a05'];
const plum: MantineColorsTuple = ['#f7edf5', '#ebd6e6', '#d9b0cf', '#c487b6', '#b064a0', '#9b4c8c', '#843c77', '#6c3062', '#55264d', '#3d1b37'];

export const theme = createTheme({
  primaryColor: 'lagoon',
  primaryShade: { light: 8, dark: 5 },
  colors: { lagoon, stone, amber, plum },
  fontFamily: 'Manrope, system-ui, sans-serif',
  headings: { fontFamily: 'Manrope, system-ui, sans-serif', fontWeight: '700' },
  defaultRadius: 'md',
  white: '#fffdfa',
  black: '#2f2b26',
  components: {
    Button: Button.extend({ defaultProps: { radius: 'md' } }),
    Card: Card.extend({ defaultProps: { withBorder: true, radius: 'md', padding: 'lg' } }),
    Paper: Paper.extend({ defaultProps: { radius: 'md' } }),
    Badge: Badge.extend({ defaultProps: { radius: 'sm', variant: 'light' } }),
    Table: Table.extend({ defaultProps: { verticalSpacing: 6, horizontalSpacing: 'sm', highlightOnHover: true, striped: false } }),
    TextInput: TextInput.extend({ defaultProps: { radius: 'md' } }),
  },
});
