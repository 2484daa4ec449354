// The shared tablet's picker (device cookie, no session needed): the tablet's name, its
// workshop and the enabled casters and finishers who have a PIN. 401 without a live device cookie.
import { tabletPicker } from '../../services/tablets'

export default defineEventHandler(async (event) => {
  const tablet = await requireTablet(event)
  return tabletPicker(tablet)
})
