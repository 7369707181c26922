/**
 * Margin reports (issue 6): freezing a link's analysis into an immutable revision, and
 * the review flow draft -> submitted -> signed off | returned. Each step runs in one
 * managed transaction that locks the revision row (SELECT ... FOR UPDATE), checks the
 * state (and the caller's version, when given) and writes its review event and audit row;
 * two reviewers deciding at once are serialised by the lock, and the second finds the
 * state moved on: a ConflictError (409). Mails leave after the commit.
 */
import { Op, type Transaction } from 'sequelize'
import type { Page } from '../utils/paging'
import type { CommentTarget, FreezeBody, ReportState } from '../../shared/schemas/report'
import { REPORT_STATE_LABEL, revisionLabel } from '../../shared/schemas/report'
import type { Role } from '../../shared/schemas/roles'
import { Capture, Link, Membership, Project, ReportComment, ReportEvent, ReportRevision, User } from '../db/models'
import { freezeCaptures } from '../reports/captures'
import { freezeAnalysis, recomputeRevision } from '../reports/freeze'
import { useDb } from '../utils/db'
import { ConflictError, ForbiddenError, InvalidError } from '../utils/errors'
import { sendMail } from '../mail/send'
import { reportDecidedMail, reportSubmittedMail, type RevisionRef } from '../mail/templates'
import { appUrl } from '../utils/settings'
import { requireCompleteSpec } from './analysis'
import { audit } from './audit'
import { readPolicy } from './policy'

/** What a mail says about a revision. */
function revisionRef(rev: ReportRevision): RevisionRef {
  return { id: rev.id, label: revisionLabel(rev.number), linkName: rev.linkName, projectName: rev.projectName, verdict: rev.verdict }
}

const people = [
  { model: User, as: 'author', attributes: ['id', 'name', 'email'] },
  { model: User, as: 'reviewer', attributes: ['id', 'name', 'email'] },
  { model: User, as: 'decider', attributes: ['id', 'name', 'email'] },
]

/**
 * Everything the report page shows: people, review steps and comments, in order, and
 * which of the frozen captures still exist (only those get a download link).
 */
export async function loadRevision(id: number, transaction?: Transaction) {
  const rev = await ReportRevision.findByPk(id, {
    include: [
      ...people,
      { model: ReportEvent, as: 'events', include: [{ model: User, as: 'actor', attributes: ['id', 'name'] }, { model: User, as: 'reviewer', attributes: ['id', 'name'] }] },
      { model: ReportComment, as: 'comments', include: [{ model: User, as: 'author', attributes: ['id', 'name'] }] },
    ],
    order: [
      [{ model: ReportEvent, as: 'events' }, 'id', 'ASC'],
      [{ model: ReportComment, as: 'comments' }, 'id', 'ASC'],
    ],
    transaction,
    rejectOnEmpty: true,
  })
  const ids = (rev.captures ?? []).map((c) => c.id)
  const live = ids.length ? await Capture.findAll({ where: { id: { [Op.in]: ids }, teamId: rev.teamId }, attributes: ['id'], transaction }) : []
  rev.liveCaptureIds = live.map((c) => c.id)
  return rev
}

/** The newest revision number of a link (0 when none). */
export async function latestNumber(linkId: number | null, transaction?: Transaction): Promise<number> {
  if (linkId === null) return 0
  const n = await ReportRevision.max<number, ReportRevision>('number', { where: { linkId }, transaction })
  return n ?? 0
}

/**
 * Freeze the link's saved definition and its analysis by today's engine into the next
 * revision (a draft). The link row is locked so two freezes number r1, r2 in order; a
 * stale `linkVersion` (someone saved since the caller looked) is a 409.
 */
export async function freezeRevision(link: Link, userId: number, body: FreezeBody) {
  const id = await useDb().transaction(async (transaction) => {
    const locked = await Link.findByPk(link.id, { transaction, lock: transaction.LOCK.UPDATE, rejectOnEmpty: true })
    if (body.linkVersion !== undefined && body.linkVersion !== locked.version)
      throw new ConflictError('the link was saved by someone else since you opened it; reload it before freezing a revision', { currentVersion: locked.version })
    const frozen = freezeAnalysis(requireCompleteSpec(locked.spec, 'frozen into a revision'), body.pullup)
    const project = await Project.findByPk(locked.projectId, { transaction, rejectOnEmpty: true })
    const { policy } = await readPolicy(locked.teamId)
    const number = (await latestNumber(locked.id, transaction)) + 1
    // the captures that back this revision: a snapshot, so a later deletion leaves the report as it was
    const done = await Capture.findAll({
      where: { linkId: locked.id, status: 'done' },
      attributes: { exclude: ['waveform'] },
      include: [{ model: User, as: 'owner', attributes: ['id', 'name'] }],
      order: [['id', 'ASC']],
      transaction,
    })
    const captures = freezeCaptures(done, frozen.input)
    const rev = await ReportRevision.create(
      {
        teamId: locked.teamId,
        projectId: locked.projectId,
        linkId: locked.id,
        number,
        linkVersion: locked.version,
        linkName: locked.name,
        projectName: project.name,
        protocol: frozen.input.protocol,
        // through JSON, as JSONB stores it: the stored result is what later reads return
        input: JSON.parse(JSON.stringify(frozen.input)),
        result: JSON.parse(JSON.stringify(frozen.result)),
        verdict: frozen.verdict,
        engineVersion: frozen.engineVersion,
        assumptions: frozen.assumptions,
        pullup: frozen.pullup ? JSON.parse(JSON.stringify(frozen.pullup)) : null,
        captures: JSON.parse(JSON.stringify(captures)),
        thresholds: { guardBandUi: policy.guardBandUi, thinSlackFraction: policy.thinSlackFraction },
        authorId: userId,
      },
      { transaction },
    )
    await ReportEvent.create({ revisionId: rev.id, action: 'freeze', actorId: userId, reviewerId: null, note: null }, { transaction })
    await audit(transaction, {
      teamId: rev.teamId,
      userId,
      action: 'report.freeze',
      entity: 'report',
      entityId: rev.id,
      detail: { linkId: link.id, revision: revisionLabel(number), linkVersion: locked.version, verdict: frozen.verdict, engineVersion: frozen.engineVersion, captureIds: captures.map((c) => c.id) },
    })
    return rev.id
  })
  return loadRevision(id)
}

/** Lock the revision row for a review step and check the caller's version. */
async function lockForStep(id: number, transaction: Transaction, version: number | undefined) {
  const rev = await ReportRevision.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE, rejectOnEmpty: true })
  if (version !== undefined && version !== rev.version)
    throw new ConflictError('the report changed since you opened it; reload it', { currentVersion: rev.version, state: rev.state })
  return rev
}

function stateConflict(rev: ReportRevision, wanted: string): ConflictError {
  return new ConflictError(`this revision is ${REPORT_STATE_LABEL[rev.state as ReportState]}, not ${wanted}`, { currentVersion: rev.version, state: rev.state })
}

/** Submit a draft to a reviewer (or admin) of the team other than the author; mails the reviewer. */
export async function submitRevision(revisionId: number, actorId: number, reviewerId: number, version?: number) {
  const { rev, reviewer, actor } = await useDb().transaction(async (transaction) => {
    const rev = await lockForStep(revisionId, transaction, version)
    if (rev.state !== 'draft') throw stateConflict(rev, 'a draft')
    const membership = await Membership.findOne({ where: { teamId: rev.teamId, userId: reviewerId, role: { [Op.in]: ['reviewer', 'admin'] } }, transaction })
    if (!membership) throw InvalidError.of(['reviewerId'], 'the reviewer must be a reviewer or admin of this team')
    if (reviewerId === rev.authorId) throw InvalidError.of(['reviewerId'], 'nobody reviews their own revision: name another reviewer')
    const reviewer = await User.findByPk(reviewerId, { transaction, rejectOnEmpty: true })
    const actor = await User.findByPk(actorId, { transaction, rejectOnEmpty: true })
    await rev.update({ state: 'submitted', reviewerId, submittedAt: new Date(), version: rev.version + 1 }, { transaction })
    await ReportEvent.create({ revisionId: rev.id, action: 'submit', actorId, reviewerId, note: null }, { transaction })
    await audit(transaction, { teamId: rev.teamId, userId: actorId, action: 'report.submit', entity: 'report', entityId: rev.id, detail: { revision: revisionLabel(rev.number), reviewerId } })
    return { rev, reviewer, actor }
  })
  await sendMail(reportSubmittedMail(reviewer, actor, revisionRef(rev), `${appUrl()}/reports/${rev.id}`))
  return loadRevision(revisionId)
}

/**
 * Sign off or return a submitted revision. Only a reviewer or admin (the route's role
 * check) other than the author; a return carries a comment, kept with the report.
 * Mails the author.
 */
export async function decideRevision(revisionId: number, actorId: number, decision: 'sign-off' | 'return', note: string | undefined, version?: number) {
  const { rev, author, actor } = await useDb().transaction(async (transaction) => {
    const rev = await lockForStep(revisionId, transaction, version)
    if (rev.authorId === actorId) throw new ForbiddenError(decision === 'sign-off' ? 'nobody signs off their own revision' : 'nobody returns their own revision')
    if (rev.state !== 'submitted') throw stateConflict(rev, 'submitted')
    const actor = await User.findByPk(actorId, { transaction, rejectOnEmpty: true })
    const author = rev.authorId === null ? null : await User.findByPk(rev.authorId, { transaction })
    const now = new Date()
    await rev.update(
      { state: decision === 'sign-off' ? 'signed-off' : 'returned', decidedBy: actorId, decidedAt: now, decisionNote: note ?? null, version: rev.version + 1 },
      { transaction },
    )
    if (note) await ReportComment.create({ revisionId: rev.id, authorId: actorId, target: { kind: 'report' }, body: note }, { transaction })
    await ReportEvent.create({ revisionId: rev.id, action: decision, actorId, reviewerId: rev.reviewerId, note: note ?? null }, { transaction })
    await audit(transaction, {
      teamId: rev.teamId,
      userId: actorId,
      action: decision === 'sign-off' ? 'report.sign-off' : 'report.return',
      entity: 'report',
      entityId: rev.id,
      detail: { revision: revisionLabel(rev.number), ...(note ? { comment: note } : {}) },
    })
    return { rev, author, actor }
  })
  if (author) {
    await sendMail(reportDecidedMail(author, actor, revisionRef(rev), decision, note ?? null, `${appUrl()}/reports/${rev.id}`))
  }
  return loadRevision(revisionId)
}

/** Check that a comment's target exists in the revision's frozen result. */
function checkTarget(rev: ReportRevision, target: CommentTarget) {
  const r = rev.result
  if (target.kind === 'report') return
  if (target.kind === 'check') {
    if (!r.spi?.checks.some((c) => c.id === target.id)) throw InvalidError.of(['target', 'id'], `this revision has no SPI check '${target.id}'`)
    return
  }
  const ch = r.channels.find((c) => c.id === target.channelId)
  if (!ch) throw InvalidError.of(['target', 'channelId'], `this revision has no channel '${target.channelId}'`)
  if (target.kind === 'stage' && !ch.stages[target.index]) throw InvalidError.of(['target', 'index'], `channel '${target.channelId}' has no stage ${target.index + 1}`)
  if (target.kind === 'bit') {
    const u = r.uart?.byChannel.find((c) => c.channelId === target.channelId)
    if (!u) throw InvalidError.of(['target', 'channelId'], `channel '${target.channelId}' has no UART bits`)
    if (!u.bits[target.index]) throw InvalidError.of(['target', 'index'], `channel '${target.channelId}' has no bit ${target.index}`)
  }
}

/** Add a comment on the report, a bit, a check or a stage (any state: a signed-off report can still be discussed). */
export async function addComment(rev: ReportRevision, authorId: number, target: CommentTarget, body: string) {
  checkTarget(rev, target)
  return useDb().transaction(async (transaction) => {
    const c = await ReportComment.create({ revisionId: rev.id, authorId, target, body }, { transaction })
    await audit(transaction, { teamId: rev.teamId, userId: authorId, action: 'report.comment', entity: 'report', entityId: rev.id, detail: { revision: revisionLabel(rev.number), commentId: c.id, target } })
    await c.reload({ include: [{ model: User, as: 'author', attributes: ['id', 'name'] }], transaction })
    return c
  })
}

export function listComments(revisionId: number) {
  return ReportComment.findAll({ where: { revisionId }, include: [{ model: User, as: 'author', attributes: ['id', 'name'] }], order: [['id', 'ASC']] })
}

/** Recompute from the stored input with today's engine (reads only). */
export function recompute(rev: ReportRevision) {
  return recomputeRevision(rev.input, rev.result)
}

/** Reviewers and admins of the team other than the author: whom a draft can be submitted to. */
export async function reviewerOptions(rev: ReportRevision) {
  const ms = await Membership.findAll({
    where: { teamId: rev.teamId, role: { [Op.in]: ['reviewer', 'admin'] }, ...(rev.authorId !== null ? { userId: { [Op.ne]: rev.authorId } } : {}) },
    include: [{ model: User, as: 'user', attributes: ['id', 'name'] }],
  })
  return ms
    .filter((m) => m.user)
    .map((m) => ({ id: m.user!.id, name: m.user!.name, role: m.role as 'admin' | 'reviewer' }))
    .sort((a, b) => a.name.localeCompare(b.name))
}

/** What waits for the user: submitted revisions in teams where they review, not their own, named to them first. */
export async function reviewQueue(userId: number) {
  const ms = await Membership.findAll({ where: { userId, role: { [Op.in]: ['reviewer', 'admin'] } } })
  if (!ms.length) return []
  const revs = await ReportRevision.findAll({
    where: { teamId: { [Op.in]: ms.map((m) => m.teamId) }, state: 'submitted', authorId: { [Op.or]: [{ [Op.ne]: userId }, { [Op.is]: null }] } },
    attributes: { exclude: ['input', 'result', 'pullup', 'assumptions', 'captures', 'thresholds'] },
    include: people,
    order: [['submittedAt', 'ASC']],
  })
  return revs.sort((a, b) => Number(b.reviewerId === userId) - Number(a.reviewerId === userId))
}

/** The revisions of one link, newest first (without the frozen documents). */
export function linkRevisions(linkId: number, page: Page) {
  return ReportRevision.findAndCountAll({
    where: { linkId },
    attributes: { exclude: ['input', 'result', 'pullup', 'assumptions', 'captures', 'thresholds'] },
    include: people,
    order: [['number', 'DESC']],
    limit: page.limit,
    offset: page.offset,
    distinct: true,
  })
}

/** The newest revision of each link of a project. */
export async function latestRevisions(projectId: number) {
  const revs = await ReportRevision.findAll({
    where: { projectId },
    attributes: ['id', 'linkId', 'number', 'state', 'verdict', 'createdAt'],
    order: [['linkId', 'ASC'], ['number', 'DESC']],
  })
  const seen = new Set<number>()
  return revs.filter((r) => r.linkId !== null && !seen.has(r.linkId) && (seen.add(r.linkId), true))
}

/** What the caller may do with the revision now (the same rules the steps enforce). */
export function abilities(rev: ReportRevision, role: Role, userId: number) {
  const engineer = role === 'admin' || role === 'engineer'
  const reviewer = role === 'admin' || role === 'reviewer'
  return {
    submit: engineer && rev.state === 'draft',
    comment: role !== 'viewer',
    decide: reviewer && rev.state === 'submitted' && rev.authorId !== userId,
    freeze: engineer && rev.linkId !== null,
  }
}
