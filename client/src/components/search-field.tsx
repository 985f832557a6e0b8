import { TextInput } from '@mantine/core';
import { IconSearch } from '@tabler/icons-react';

/** The search box above a directory table. */
export function SearchField({ label, placeholder, value, onChange }: { label: string; placeholder: string; value: string; onChange: (v: string) => void }) {
  return <TextInput aria-label={label} placeholder={placeholder} leftSection={<IconSearch size={14} />} w={320} value={value} onChange={(e) => onChange(e.currentTarget.value)} />;
}
