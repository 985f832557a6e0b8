export type ToothNotationSetting = 'fdi' | 'universal';

/** Weekly wall-clock opening hours; weekday 1 = Monday … 7 = Sunday (ISO 8601). */
export type OpeningHours = { weekday: number; open: string; close: string }[];

export interface PracticeSettings {
  toothNotation: ToothNotationSetting;
  bookingGridMinutes: number;
  lateCancellationHours: number;
}

export interface MicroscopeSummary {
  id: number;
  name: string;
  mobile: boolean;
  locationId: number;
}

export interface ChairSummary {
  id: number;
  name: string;
  locationId: number;
  fixedMicroscopeId: number | null;
}

export interface LocationSummary {
  id: number;
  name: string;
  address: string | null;
  phone: string | null;
  timeZone: string;
  openingHours: OpeningHours;
  chairs: ChairSummary[];
  microscopes: MicroscopeSummary[];
}

export interface PracticeSummary {
  id: number;
  name: string;
  phone: string | null;
  email: string | null;
  settings: PracticeSettings;
}
