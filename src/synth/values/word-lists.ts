/**
 * Invented demo vocabulary. Given names are ordinary given names; family names, places and streets are made up for
 * this project so that no filled form describes a real person or business.
 */
export const GIVEN_NAMES = [
  'Ada', 'Bram', 'Celia', 'Dorian', 'Elsa', 'Fenwick', 'Greta', 'Hollis', 'Ines', 'Jasper', 'Kira', 'Lionel', 'Mara',
  'Niall', 'Odette', 'Perrin', 'Quinn', 'Rosalind', 'Silas', 'Tamsin', 'Ulric', 'Vera', 'Wendell', 'Ysolde', 'Zane',
  'Noor', 'Tobin', 'Marisol', 'Emeric', 'Juniper', 'Anselm', 'Lark', 'Dario', 'Priya', 'Kenji', 'Amara',
];

export const FAMILY_NAMES = [
  'Ashgrove', 'Brackenridge', 'Coldwater', 'Dunmere', 'Elderholm', 'Fairweather', 'Gillamor', 'Hawthorne-Vey',
  'Ivesdale', 'Jorvane', 'Kettleby', 'Larkspur', 'Merriwick', 'Northam', 'Oakenfold', 'Penhallow', 'Quillon',
  'Ravensmoor', 'Stellwood', 'Tamberlin', 'Underhay', 'Vantreece', 'Wexmoor', 'Yarrowby', 'Zellner-Oddy',
  'Brightwell', 'Cobbleton', 'Drummick', 'Fenlowe', 'Halloway',
];

export const PET_NAMES = [
  'Biscuit', 'Pepper', 'Moss', 'Clementine', 'Rufus', 'Juniper', 'Tater', 'Noodle', 'Sable', 'Waffles', 'Ziggy',
  'Marble', 'Pickle', 'Rosie', 'Cinder', 'Bramble', 'Otto', 'Fig', 'Luna', 'Scout',
];

export const BREEDS = [
  'Mixed', 'Beagle mix', 'Tabby', 'Siamese', 'Lop', 'Terrier mix', 'Collie', 'Shorthair', 'Poodle mix', 'Calico',
  'Holland Lop', 'Cockatiel', 'Greyhound', 'Maine Coon', 'Spaniel mix',
];

export const STREETS = [
  'Quarry Lane', 'Heron Way', 'Old Mill Road', 'Larch Street', 'Tidewater Drive', 'Foxglove Court', 'Saltmarsh Road',
  'Elm Terrace', 'Beacon Hill Rd', 'Orchard Row', 'Kestrel Avenue', 'Copper Creek Rd', 'Willowbend Way', 'Harbor St',
];

export const CITIES = [
  'Maple Hollow', 'Port Aldery', 'Cedarmouth', 'Wrenfield', 'Lowbridge', 'Ashby Falls', 'North Tarrow', 'Glenmarrow',
  'Silverkirk', 'Brindle Bay', 'Eastwick Hollow', 'Fernmoor', 'Oxley Point', 'Stonebridge',
];

export const BOAT_NAMES = [
  'Sea Biscuit II', 'Tern Again', 'Knot Working', 'Blue Heron', 'Second Wind', 'Low Tide', 'Marigold', 'Salt Whisper',
  'Ripple Effect', 'Gull Friday', 'Quiet Harbor', 'Driftwood',
];

export const BOAT_MAKES = ['Sloop', 'Cabin cruiser', 'Catamaran', 'Trawler', 'Center console', 'Daysailer', 'Ketch', 'Pontoon'];

export const CROPS = [
  'Tomatoes', 'Squash', 'Beans', 'Kale', 'Peppers', 'Garlic', 'Herbs', 'Sunflowers', 'Carrots', 'Lettuce', 'Onions',
  'Strawberries', 'Pumpkins', 'Radishes',
];

export const OCCUPATIONS = ['Teacher', 'Nurse', 'Carpenter', 'Student', 'Retired', 'Engineer', 'Baker', 'Librarian', 'Courier', 'Farmer'];

export const NOTE_SENTENCES = [
  'Prefers morning appointments.',
  'Gets nervous in the car, please call ahead.',
  'Allergic to chicken based food.',
  'Will share the plot with a neighbor.',
  'Needs a raised bed near the path.',
  'Has a trailer that stays on site.',
  'Arriving late in the evening.',
  'Please use the side gate.',
  'Second vehicle parked in lot B.',
  'Happy to help with the compost rota.',
];

/**
 * Geographic area codes (NANP) used with the fictional 555-0100..0199 line range, which the North American
 * Numbering Plan Administrator reserves for fictional use; the area codes are real so that the numbers parse as valid.
 */
export const AREA_CODES = ['207', '303', '312', '404', '415', '503', '512', '603', '617', '702', '802', '808', '907', '919', '971'];

export const EMAIL_DOMAINS = ['example.org', 'example.com'];
