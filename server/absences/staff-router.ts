import type { Request } from 'express';
import { ApiRoutes, STAFF_UP } from '../http/routes';
import { HttpError } from '../http/errors';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { requestAbsenceBody } from '../../shared/api/absences';
import type { Person } from '../db/models';
import { findPerson } from '../people/repository';
import { createAbsence, myAbsences, withdrawMyAbsence } from './repository';

const ws = (req: Request) => req.auth!.workspaceId;

/** The caller's linked person in this workspace, or null. */
async function linkedPerson(req: Request): Promise<Person | null> {
  const personId = req.auth!.personId;
  return personId ? findPerson(ws(req), personId) : null;
}

/** /api/me/absences: a staff member's own absences and requests; never anyone else's. */
export function staffAbsencesRouter() {
  const r = new ApiRoutes('/me');
  r.get('/absences', STAFF_UP, async (req, res) => {
    const person = await linkedPerson(req);
    res.json({ items: person ? await myAbsences(ws(req), person.id) : [] });
  });
  r.post('/absences', STAFF_UP, validate({ body: requestAbsenceBody }), async (req, res) => {
    const person = await linkedPerson(req);
    if (!person) {
      throw new HttpError(409, 'conflict', 'Your account is not linked to a person on this workspace’s roster yet, so there is nobody to record the absence for. Ask an admin to link it (Members), then try again.', [
        { path: 'auth.personId', message: 'no linked person' },
      ]);
    }
    // Credit is the coordinator's to set (or the workspace default); a request cannot grant itself hours.
    if (typeof req.body.creditHours === 'number') throw new HttpError(403, 'forbidden', 'Credited hours are set by a coordinator; leave them out of your request.', [{ path: 'body.creditHours', message: 'set by a coordinator' }]);
    res.status(201).json(await createAbsence(ws(req), { ...req.body, personId: person.id }, { userId: req.auth!.userId, status: 'requested' }));
  });
  r.delete('/absences/:id', STAFF_UP, validate({ params: idParams }), async (req, res) => {
    const person = await linkedPerson(req);
    if (!person) throw new HttpError(404, 'not_found', 'Absence not found');
    await withdrawMyAbsence(ws(req), person.id, Number(req.params.id));
    res.status(204).end();
  });
  return r.router;
}
