import express, { Router } from 'express';
import type { Sequelize } from 'sequelize';
import { Site } from '../../db/models.ts';
import { inspectAckLink, useAckLink } from './ack.service.ts';
import { ACK_PAGE_CSP, renderAckPage } from './ack-page.ts';

/** /ack/:token — the acknowledge link from escalation mail (public by design: the token is the credential). */
export function ackRouter(secret: string | undefined, db: () => Sequelize = () => Site.sequelize!, https = false): Router {
  const r = Router();
  r.use(express.urlencoded({ extended: false, limit: '8kb' }));
  const send = (res: express.Response, page: Parameters<typeof renderAckPage>[0], action: string) => {
    const { status, html } = renderAckPage(page, action);
    const csp = https ? `${ACK_PAGE_CSP}; upgrade-insecure-requests` : ACK_PAGE_CSP;
    res.status(status).set('Cache-Control', 'no-store').set('Content-Security-Policy', csp).type('html').send(html);
  };
  r.get('/:token', async (req, res) => {
    send(res, secret ? await inspectAckLink(db(), secret, req.params.token) : null, req.originalUrl);
  });
  r.post('/:token', async (req, res) => {
    const comment = typeof req.body?.comment === 'string' ? req.body.comment : undefined;
    send(res, secret ? await useAckLink(db(), secret, req.params.token, new Date(), comment) : null, req.originalUrl);
  });
  return r;
}
