// Shapes of the documents the core returns (see crate/src/wasm.rs and crate/src/export/).

export type LonLat = [number, number];

export interface Location {
  layer: string;
  feature: number | null;
  id: string | null;
  property: string | null;
}

export interface Message {
  at: Location | null;
  message: string;
}

export interface Feature<P = Record<string, unknown>> {
  type: 'Feature';
  geometry: { type: string; coordinates: unknown } | null;
  properties: P;
}

export interface FeatureCollection<P = Record<string, unknown>> {
  type: 'FeatureCollection';
  features: Feature<P>[];
  caution?: string;
}

export interface RouteProps {
  home_id: string;
  school_id: string | null;
  children: number;
  kind: 'shortest' | 'recommended' | 'safe';
  network_m: number;
  walked_m: number;
  walking_time_min: number;
  crossings: number;
  crossings_by_device: Record<string, number>;
  uncontrolled_crossings: number;
  arterial_crossings: number;
  arterial_exposure_m: number;
  along_le30_m: number;
  along_31_50_m: number;
  along_gt50_m: number;
  no_sidewalk_m: number;
  risk: number;
  over_detour_cap: boolean;
  [k: string]: unknown;
}

export interface SchoolSummary {
  id: string;
  name: string;
  homes: number;
  children: number;
  children_routed: number;
  children_in_walk_zone: number;
  mean_shortest_network_m: number | null;
  mean_uncontrolled_crossings: number | null;
  mean_risk_per_trip: number | null;
  [k: string]: unknown;
}

export interface Summary {
  caution: string;
  network: Record<string, number>;
  qa: Record<string, number>;
  warnings: number;
  homes: number;
  children: number;
  walk_zone_m: number;
  schools: SchoolSummary[];
  timings_ms: { parse_ms: number; network_ms: number; routing_ms: number; total_ms: number };
  config: Record<string, unknown>;
  [k: string]: unknown;
}

export interface Control {
  device: string;
  refuge_island: boolean;
  raised: boolean;
  guard: unknown[] | null;
}

export interface CrossingPoint {
  feature: number;
  id: string;
  at: LonLat;
  control: Control;
  scope: string;
}

export interface School {
  feature: number;
  id: string;
  name: string;
  entrances: LonLat[];
}

export interface Home {
  feature: number;
  id: string;
  at: LonLat;
  children: number;
  school: string | null;
}

export interface AuditDoc {
  summary: Summary;
  /** CSV on the Web metadata of each CSV the core writes (file name -> document). */
  csv_metadata?: Record<string, { url: string; 'dc:title': string; tableSchema: { columns: { name: string; 'dc:description': string; 'schema:unitText'?: string }[] } }>;
  homes_csv: string;
  /** The audit the worker holds for this document: its routes come from `Engine.routes`. */
  audit_id: number;
  qa: FeatureCollection;
  /** West, south, east, north of the noded centrelines (null for none). */
  bounds: [number, number, number, number] | null;
  /** The named streets as drawn, with their names: labels and the find box. */
  street_names: FeatureCollection;
  layers: {
    crossings: CrossingPoint[];
    schools: School[];
    homes: Home[];
    catchments: { feature: number; school_id: string }[];
  };
  warnings: Message[];
  /** Extra documents the core adds as they land (catchment scores, hotspots, ...). */
  [k: string]: unknown;
}

/** One layer file as loaded by the planner. */
export interface LayerFile {
  name: string;
  text: string;
}

export type LayerKey = 'streets' | 'crossings' | 'schools' | 'homes' | 'catchments' | 'crashes' | 'mapping';

export const LAYER_KEYS: LayerKey[] = ['streets', 'crossings', 'schools', 'homes', 'catchments', 'crashes', 'mapping'];

/** Messages between the page and its worker. */
export type ToWorker =
  | { type: 'init'; module: WebAssembly.Module }
  | { type: 'audit'; id: number; layers: string; config: string }
  | { type: 'plan'; id: number; layers: string; config: string; budget: number }
  | { type: 'convert'; id: number; layer: string; name: string; bytes: ArrayBuffer; crs: string }

  | { type: 'reaudit'; id: number; interventions: string }
  | { type: 'routes'; id: number; audit: number; query: string }
  | { type: 'segment'; id: number; audit: number; segment: number }
  | { type: 'tile'; id: number; layer: TileLayer; audit: number; z: number; x: number; y: number }
  | { type: 'release'; id: number; audit: number }
  | { type: 'compare'; id: number; before: string; after: string }
  | { type: 'write_project'; id: number; project: string }
  | { type: 'read_project'; id: number; bytes: Uint8Array };

export type FromWorker =
  | { type: 'ready'; defaultConfig: string; caution: string; ruleSets: Record<string, string>; configBounds?: string }
  | { type: 'progress'; id: number; stage: string; done: number; total: number }
  | { type: 'done'; id: number; doc: string; ms: number; bytes?: Uint8Array }
  | { type: 'failed'; id: number; error: string };

/** The map layers the worker cuts vector tiles of (the core's `streetTile`, `hotspotTile`). */
export type TileLayer = 'streets' | 'hotspots';
