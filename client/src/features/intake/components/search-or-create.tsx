import { Combobox, Group, Loader, Text, TextInput, useCombobox } from '@mantine/core';
import { IconPlus, IconSearch } from '@tabler/icons-react';
import { useEffect, type ReactNode, type Ref } from 'react';

const NEW = '__new__';

export interface SearchOrCreateProps<T> {
  label: string;
  placeholder: string;
  query: string;
  onQueryChange: (q: string) => void;
  /** Matches for the current query; undefined while the first search runs. */
  results: T[] | undefined;
  loading: boolean;
  idOf: (item: T) => number;
  renderItem: (item: T) => ReactNode;
  /** Text of the last option, e.g. 'New patient “Lark”'. */
  createLabel: (q: string) => string;
  onPick: (item: T) => void;
  onCreate: (q: string) => void;
  error?: ReactNode;
  inputRef?: Ref<HTMLInputElement>;
  autoFocus?: boolean;
  /** Fewer characters than this show no list: one letter matches half the practice. */
  minChars?: number;
}

/** A search box whose list always ends with "create new", so the desk never leaves the form. */
export function SearchOrCreate<T>(p: SearchOrCreateProps<T>) {
  const combobox = useCombobox({ onDropdownClose: () => combobox.resetSelectedOption() });
  const min = p.minChars ?? 2;
  const ready = p.query.trim().length >= min;
  const items = ready ? (p.results ?? []) : [];

  // Enter takes the best match at once; with no match it is the "new" option.
  useEffect(() => {
    if (ready && combobox.dropdownOpened) combobox.selectFirstOption();
  }, [p.results, ready, combobox.dropdownOpened]);

  return (
    <Combobox
      store={combobox}
      onOptionSubmit={(value) => {
        combobox.closeDropdown();
        if (value === NEW) p.onCreate(p.query.trim());
        else {
          const hit = items.find((i) => String(p.idOf(i)) === value);
          if (hit) p.onPick(hit);
        }
      }}
    >
      <Combobox.Target withExpandedAttribute>
        <TextInput
          ref={p.inputRef}
          label={p.label}
          placeholder={p.placeholder}
          value={p.query}
          autoFocus={p.autoFocus}
          autoComplete="off"
          leftSection={<IconSearch size={16} />}
          rightSection={p.loading ? <Loader size="xs" aria-label="Searching" /> : null}
          error={p.error}
          onChange={(e) => {
            p.onQueryChange(e.currentTarget.value);
            combobox.openDropdown();
            combobox.updateSelectedOptionIndex();
          }}
          onFocus={() => combobox.openDropdown()}
          onClick={() => combobox.openDropdown()}
          onBlur={() => combobox.closeDropdown()}
          // Enter picks an option (Mantine handles it after this); it must never submit the whole referral.
          onKeyDown={(e) => e.key === 'Enter' && e.preventDefault()}
        />
      </Combobox.Target>
      <Combobox.Dropdown hidden={!ready}>
        <Combobox.Options mah={280} style={{ overflowY: 'auto' }}>
          {items.map((item) => (
            <Combobox.Option key={p.idOf(item)} value={String(p.idOf(item))}>
              {p.renderItem(item)}
            </Combobox.Option>
          ))}
          {ready && !p.loading && items.length === 0 && (
            <Text fz="xs" c="dimmed" px="sm" py={4}>
              No match for “{p.query.trim()}”.
            </Text>
          )}
          <Combobox.Option value={NEW}>
            <Group gap={6} wrap="nowrap">
              <IconPlus size={14} />
              <Text fz="sm" fw={600} c="lagoon.8">
                {p.createLabel(p.query.trim())}
              </Text>
            </Group>
          </Combobox.Option>
        </Combobox.Options>
      </Combobox.Dropdown>
    </Combobox>
  );
}
