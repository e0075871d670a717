import { useMemo } from 'react';
import { usePeople } from '@/hooks/api/get-people';
import { useSkills } from '@/hooks/api/get-skills';
import { useShifts } from '@/hooks/api/get-shifts';
import { usePins } from '@/hooks/api/get-pins';
import type { ShiftDto } from '@/hooks/api/roster-types';

export interface SeatView {
  seatId: number;
  shift: ShiftDto;
  skillId: number | null;
  skillName: string;
  personId: number | null;
  pinned: { personId: number | null } | null;
}

/**
 * Everything the result, edit and publish screens join together: shifts and seats, who sits where
 * (for a given assignment), people's names and skills, and pins.
 */
export function useRosterView(rosterId: number, assignment: Map<number, number | null> | null) {
  const shifts = useShifts(rosterId);
  const people = usePeople({ pageSize: 200, sort: 'name' });
  const skills = useSkills();
  const pins = usePins(rosterId);
  const view = useMemo(() => {
    if (!shifts.data || !people.data || !skills.data || !pins.data) return null;
    const personName = new Map(people.data.items.map((p) => [p.id, p.name]));
    const skillName = new Map(skills.data.map((s) => [s.id, s.name]));
    const pinBySeat = new Map(pins.data.map((p) => [p.seatId, { personId: p.personId }]));
    const byDay = new Map<string, ShiftDto[]>();
    const seats: SeatView[] = [];
    for (const s of shifts.data) {
      const day = s.startsLocal.slice(0, 10);
      byDay.set(day, [...(byDay.get(day) ?? []), s]);
      for (const seat of s.seats) {
        seats.push({
          seatId: seat.id,
          shift: s,
          skillId: seat.skillId,
          skillName: seat.skillId === null ? 'anyone' : (skillName.get(seat.skillId) ?? 'a skill'),
          personId: assignment?.get(seat.id) ?? null,
          pinned: pinBySeat.get(seat.id) ?? null,
        });
      }
    }
    const seatsOf = (shiftId: number) => seats.filter((x) => x.shift.id === shiftId);
    return {
      shifts: shifts.data,
      byDay,
      seats,
      seatsOf,
      people: people.data.items,
      personName: (id: number | null) => (id === null ? 'open' : (personName.get(id) ?? `person ${id}`)),
      skillName: (id: number | null) => (id === null ? 'anyone' : (skillName.get(id) ?? 'a skill')),
      pins: pinBySeat,
    };
  }, [shifts.data, people.data, skills.data, pins.data, assignment]);
  const error = shifts.error ?? people.error ?? skills.error ?? pins.error;
  return { view, error, isPending: !view && !error };
}
