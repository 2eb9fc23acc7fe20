/** The views a film can be filed under (product design: Image.view). */
export type FilmView =
  'lateral-neutral' | 'lateral-flexion' | 'lateral-extension' | 'lateral-standing-long' | 'ap'
