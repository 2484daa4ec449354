// The API quote tests' shared figures (our own worked example, priced by hand in
// tests/unit/quote-job.test.ts): the rates in pence and the two-room take-off made into a job.
export const QUOTE_RATES = {
  currency: 'GBP', plasterPerBag: 1850, mouldPerProfile: 42000, castPerLength: 3500, castPerPiece: 2800,
  fettlePerPiece: 900, fixPerMetre: 1250, deliveryPerTrip: 6000, marginPct: 15, taxPct: 20, depositPct: 30,
}

export const TWO_ROOM_TAKE_OFF = {
  rooms: [
    {
      name: 'Drawing room',
      runs: [{ profile: 'Egg-and-dart 150', walls: [{ lengthM: 5.0, end: 'internal' }, { lengthM: 3.1 }], castLengthM: 3, minPieceM: 0.3, sparesPct: 0, plasterKgPerLength: 9, newMould: true }],
      ornaments: [{ name: 'Ceiling centre 600', count: 1, plasterKgEach: 14, newMould: false }],
    },
    { name: 'Hall', runs: [], ornaments: [{ name: 'Corbel', count: 4, plasterKgEach: 3.5, newMould: true }] },
  ],
  bagKg: 25,
  deliveries: 1,
  fixing: true,
}
