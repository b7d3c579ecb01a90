// Loopfold's own icon set: 24 × 24 stroke paths, drawn for this product.
// Rendered by components/Icon.astro (server) and components/ui/Icon.tsx (islands).
export const ICONS = {
  // statuses
  folded: 'M4 8h16M4 12h16M4 16h16',
  lined: 'M5 5h14v14H5zM9 12l2 2 4-4',
  truck: 'M3 7h10v9H3zM13 10h4l3 3v3h-7M7 18.5a1.5 1.5 0 1 0 0 .01M17 18.5a1.5 1.5 0 1 0 0 .01',
  handover: 'M4 20V10l8-5 8 5v10M9 20v-6h6v6',
  waiting: 'M12 4a8 8 0 1 0 0 16a8 8 0 1 0 0-16M12 8v4l3 2',
  hold: 'M8 3h8l5 5v8l-5 5H8l-5-5V8zM12 8v5M12 16v.5',
  wrench: 'M14.5 5.5a4 4 0 0 0 4.9 4.9L21 12l-9 9-4-4 9-9zM4 20l3-3',
  question: 'M12 4a8 8 0 1 0 0 16a8 8 0 1 0 0-16M9.5 9.5a2.5 2.5 0 1 1 3.5 2.3c-.7.4-1 1-1 1.7M12 16.5v.5',
  retired: 'M12 4a8 8 0 1 0 0 16a8 8 0 1 0 0-16M8 8l8 8',
  // interface
  scan: 'M4 8V5a1 1 0 0 1 1-1h3M16 4h3a1 1 0 0 1 1 1v3M20 16v3a1 1 0 0 1-1 1h-3M8 20H5a1 1 0 0 1-1-1v-3M7 12h10',
  search: 'M10.5 4a6.5 6.5 0 1 0 0 13a6.5 6.5 0 1 0 0-13M15.5 15.5 20 20',
  home: 'M4 11l8-7 8 7M6 10v10h12V10',
  grid: 'M4 4h16v16H4zM4 10h16M4 15h16M10 4v16',
  route: 'M6 19a2 2 0 1 0 0-.01M18 5a2 2 0 1 0 0 .01M6 17V9a3 3 0 0 1 3-3h5M18 7v8a3 3 0 0 1-3 3h-5',
  label: 'M4 6h16v12H4zM7 9h4v4H7zM14 10h3M14 13h3',
  inbox: 'M4 13l2-8h12l2 8v6H4zM4 13h5l1 2h4l1-2h5',
  // a statement sheet with a torn foot and its lines
  sheet: 'M6 3h12v18l-2-1.5-2 1.5-2-1.5-2 1.5-2-1.5-2 1.5zM9 8h6M9 11h6M9 14h4',
  users: 'M9 11a3 3 0 1 0 0-6a3 3 0 0 0 0 6M3 20c0-3.3 2.7-6 6-6s6 2.7 6 6M16 5a3 3 0 0 1 0 6M18 14c1.8.7 3 2.5 3 4.5',
  settings: 'M12 9a3 3 0 1 0 0 6a3 3 0 0 0 0-6M12 3v2M12 19v2M3 12h2M19 12h2M5.6 5.6l1.4 1.4M17 17l1.4 1.4M5.6 18.4 7 17M17 7l1.4-1.4',
  mail: 'M4 6h16v12H4zM4 7l8 6 8-6',
  signout: 'M14 4h5v16h-5M10 8l-4 4 4 4M6 12h10',
  cloudOff: 'M3 3l18 18M7 18h10a4 4 0 0 0 1-7.9A6 6 0 0 0 8.2 7.4M5.5 10.5A4 4 0 0 0 7 18',
  check: 'M5 12l5 5 9-10',
  alert: 'M12 4 3 20h18zM12 10v4M12 17v.5',
  camera: 'M4 8h4l2-3h4l2 3h4v11H4zM12 10.5a3 3 0 1 0 0 6a3 3 0 0 0 0-6',
  keyboard: 'M3 7h18v10H3zM7 14h10M7 10h.5M10.5 10h.5M14 10h.5M17 10h.5',
  lanes: 'M4 7h13M14 4l3 3-3 3M20 17H7M10 14l-3 3 3 3',
  menu: 'M4 7h16M4 12h16M4 17h16',
  plusBox: 'M4 4h16v16H4zM12 8v8M8 12h8',
} as const;

export type IconName = keyof typeof ICONS;
