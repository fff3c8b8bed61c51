// Passwords people pick most often, so staff accounts never use one. See README.md for origin.

// Words and phrases that top the widely published "most common password" lists.
const BASE = `password passw0rd pass passwd letmein welcome welcome1 admin administrator root login master hello
qwerty qwertyuiop qwertyui asdfgh asdfghjkl zxcvbn zxcvbnm azerty qazwsx 1qaz2wsx qwer1234 abc abcd abcdef
abcdefg abcdefgh abc123 iloveyou loveyou lovely love monkey dragon baseball football soccer hockey basketball
batman superman spiderman ironman starwars pokemon princess sunshine shadow michael jennifer jordan hunter
ranger buster thomas tigger robert daniel charlie andrew matthew joshua jessica ashley amanda nicole michelle
justin george harley killer trustno1 whatever freedom secret cheese cookie computer internet changeme default
guest user test tester testing temp temppassword summer winter spring autumn fall monday friday sunday
january february march april june july august september october november december flower flowers
chocolate butterfly purple orange yellow silver golden diamond ginger pepper maggie sophie bailey coffee
banana apple cherry peanut chicken family forever friends blessed jesus christ heaven angel angels samsung
google yahoo hotmail facebook linkedin twitter myspace mustang corvette ferrari porsche mercedes toyota
honda yamaha harley london paris newyork chicago dallas boston texas florida america canada liverpool
arsenal chelsea barcelona madrid juventus liverpool1 manchester united yankees cowboys steelers packers
eagles lakers warriors patriots broncos raiders matrix hacker ninja samurai zombie killer1 gandalf
frodo merlin wizard dragon1 phoenix thunder lightning tiger lion wolf eagle falcon hawk panther
cowboy rockstar rocky rockyou superstar star stars moon sun sky ocean river mountain forest garden
money dollar bitcoin crypto business office work company service support manager hvac heating cooling
furnace comfort season seasonwell bluestem contractor technician homeowner customer welcome123 letmein1
passpass password1 password12 password123 pass123 pass1234 qwerty123 qwerty1 iloveyou1 abc12345 admin123
root123 test123 user123 guest123 master123 hello123 welcome12 changeme1 opensesame sesame
asdf asdf1234 zaq12wsx zaq1xsw2 1q2w3e4r 1q2w3e 1q2w3e4r5t 1q2w3e4r5t6y q1w2e3r4 q1w2e3r4t5 mnbvcxz
poiuytrewq lkjhgfdsa 0987654321 9876543210 11111111 00000000 12341234 12121212 11223344 123123 123321
112233 121212 131313 654321 666666 696969 777777 888888 987654 159753 147258 147258369 159357 741852963
blink182 nirvana metallica slipknot eminem beatles elvis marley hendrix guitar drummer music
snoopy garfield scooby mickey minnie donald pluto tweety simpsons homer bart
computer1 internet1 letmeinnow trustme ihateyou fuckyou fuckoff shit bitch asshole
sweetheart sweetie honey baby babygirl babyboy lover kisses hottie sexy beautiful pretty
qwertzuiop asdfghjklzxcvbnm 1234qwer qweasd qweasdzxc asdqwe zxcasdqwe
superman1 batman1 starwars1 pokemon1 minecraft fortnite roblox xbox playstation nintendo gamer
`
  .split(/\s+/)
  .filter(Boolean);

// Rows of a US keyboard and the number row, for walks like "qwertyuiop12" or "1qaz2wsx3edc".
const ROWS = ['1234567890', 'qwertyuiop', 'asdfghjkl', 'zxcvbnm', '0987654321', 'poiuytrewq', 'lkjhgfdsa', 'mnbvcxz'];
const COLUMNS = ['1qaz', '2wsx', '3edc', '4rfv', '5tgb', '6yhn', '7ujm', '8ik,', '9ol.', '0p;/'];

const SUFFIXES = [
  '',
  '1',
  '12',
  '123',
  '1234',
  '12345',
  '123456',
  '1234567',
  '12345678',
  '!',
  '1!',
  '123!',
  '!!',
  '01',
  '69',
  '007',
  '99',
  '00',
  '11',
  '2',
  '22',
  '13',
  '21',
  '777',
  '@123',
  '#1',
];
const YEARS = Array.from({ length: 2030 - 1960 + 1 }, (_, i) => String(1960 + i));

function generate(): Set<string> {
  const out = new Set<string>();
  const add = (s: string) => out.add(s.toLowerCase());
  for (const w of BASE) {
    for (const s of SUFFIXES) add(w + s);
    for (const y of YEARS) add(w + y);
    add(w + w);
    add(w.charAt(0).toUpperCase() + w.slice(1) + '1!');
  }
  // Keyboard walks of every length from 6, with and without number-row tails.
  for (const row of ROWS) {
    for (let len = 6; len <= row.length; len++) {
      const walk = row.slice(0, len);
      for (const s of SUFFIXES) add(walk + s);
    }
    add(row + row);
  }
  let columnWalk = '';
  for (const c of COLUMNS) {
    columnWalk += c;
    if (columnWalk.length >= 8) add(columnWalk);
  }
  // One character repeated, and short units repeated: "aaaaaaaaaaaa", "abcabcabcabc", "121212121212".
  const chars = 'abcdefghijklmnopqrstuvwxyz0123456789!@#$%*.';
  for (const c of chars) for (let len = 6; len <= 24; len++) add(c.repeat(len));
  for (const unit of ['ab', 'abc', 'abcd', '12', '123', '1234', '12345', 'qw', 'qwe', 'asd', 'xo', 'ha', 'la', 'lol', '69', '01', '10', '11', '00']) {
    for (let n = 2; n * unit.length <= 24; n++) add(unit.repeat(n));
  }
  // Counting up and down, whole and from each digit.
  const up = '01234567890123456789';
  const down = '98765432109876543210';
  for (let start = 0; start < 10; start++)
    for (let len = 6; len <= 20; len++) {
      add(up.slice(start, start + len));
      add(down.slice(start, start + len));
    }
  return out;
}

export const COMMON_PASSWORDS: ReadonlySet<string> = generate();

const LEET: Record<string, string> = { '0': 'o', '1': 'i', '3': 'e', '4': 'a', '5': 's', '7': 't', '@': 'a', $: 's', '!': 'i' };

/** Is this password on the list, as typed, with leetspeak undone, or with a digit/symbol tail removed? */
export function isCommonPassword(password: string): boolean {
  const lower = password.toLowerCase();
  if (COMMON_PASSWORDS.has(lower)) return true;
  const stem = lower.replace(/[\d\W_]+$/, '');
  if (stem.length >= 4 && COMMON_PASSWORDS.has(stem)) return true;
  const plain = lower.replace(/[013457@$!]/g, (c) => LEET[c] ?? c);
  if (COMMON_PASSWORDS.has(plain)) return true;
  const plainStem = lower.replace(/[\d\W_]+$/, '').replace(/[013457@$!]/g, (c) => LEET[c] ?? c);
  return plainStem.length >= 4 && COMMON_PASSWORDS.has(plainStem);
}

export const MIN_PASSWORD_LENGTH = 12;

/** The plain-words reason a password is refused, or null when it may be used. No composition rules. */
export function passwordProblem(password: string): string | null {
  if ([...password].length < MIN_PASSWORD_LENGTH) return `Use at least ${MIN_PASSWORD_LENGTH} characters.`;
  if (isCommonPassword(password)) return 'That password is too common and easy to guess. Try a few unrelated words.';
  return null;
}
