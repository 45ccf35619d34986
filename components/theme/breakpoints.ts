import { useWindowDimensions } from 'react-native';

export const breakpoints = { wide: 900, wall: 1800, wallXL: 3000 } as const;
export type Layout = 'phone' | 'wide' | 'wall';

export function layoutFor(width: number): Layout {
  if (width >= breakpoints.wall) return 'wall';
  if (width >= breakpoints.wide) return 'wide';
  return 'phone';
}

export function useLayout(): { layout: Layout; width: number; height: number } {
  const { width, height } = useWindowDimensions();
  return { layout: layoutFor(width), width, height };
}
