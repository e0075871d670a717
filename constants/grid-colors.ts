/**
 * The roster grid's own marks (components/rosters/grid): a shift is coloured by the part of the
 * day it starts in, so a row reads as a rhythm of mornings, afternoons, evenings and nights.
 * Chosen for Rotaloom (warm paper palette); ink on fill keeps at least 4.5:1 contrast.
 */
export const gridColors = {
  morning: { fill: '#F4E2B8', ink: '#5A3B08' },
  afternoon: { fill: '#D3E7DE', ink: '#173F3B' },
  evening: { fill: '#E6D3E2', ink: '#4F2648' },
  night: { fill: '#2F3B5E', ink: '#FFFFFF' },
  away: { fill: '#E9E4D8', ink: '#3F4B4A' },
  weekend: '#EFE8DA',
  breach: '#A3262A',
  honoured: '#2E6B3A',
  missed: '#B85F1E',
  pinned: '#1F4E4A',
} as const;
